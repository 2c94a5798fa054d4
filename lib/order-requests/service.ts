import type { Knex } from "knex";
import type { Actor } from "../auth/actor";
import { findOpenAdmission, type OpenAdmission } from "../admissions/access";
import { queueUserMail } from "../alerts/outbox";
import { recipientsFor, type AlertRecipient, type RecipientBasis } from "../alerts/recipients";
import type { Device } from "../devices";
import { getEnv } from "../env";
import { duplicateIndex } from "../db-errors";
import { ConflictError, NotFoundError, ValidationError } from "../errors";
import { once } from "../idempotency";
import { appendLedger, lockPatientChain } from "../ledger/service";
import { getCurrentOrder } from "../orders/queries";
import { transact } from "../transaction";
import {
  composeOrderRequestEmail,
  ORDER_REQUEST_PURPOSES,
  orderRequestMessageId,
  type OrderRequestPurpose,
} from "./email";
import { getOrderRequest, type OrderRequestView } from "./queries";
import type { OrderRequestData, OrderRequestReplyData } from "./schema";
import type { RequestSnapshot } from "./snapshot";

/** Why a recipient receives a request, in the e-mail's words. */
export const BASIS_WORDS: Record<RecipientBasis, string> = {
  assigned: "responsible physician of the shift",
  prescriber: "prescriber of the order in effect (no physician assigned to this bed)",
  charge: "unit's charge nurse (no physician assigned and no prescriber to reach)",
  fallback: "unit's fallback address (nobody assigned, no charge nurse)",
};

export function orderRequestEscalateMs(): number {
  return getEnv().ORDER_REQUEST_ESCALATE_MINUTES * 60_000;
}

/** The settings in use, the latest SpO2 and the order's ceilings, read in the writer's transaction. */
async function takeSnapshot(
  trx: Knex.Transaction,
  admission: OpenAdmission,
): Promise<RequestSnapshot> {
  const order = await getCurrentOrder(trx, admission.patientId);
  const s = (await trx("bedside_settings")
    .where({ admission_id: admission.admissionId })
    .first("device", "fio2", "fio2_estimated", "peep_cmh2o", "flow_l_min")) as
    | {
        device: Device;
        fio2: number;
        fio2_estimated: number;
        peep_cmh2o: number | null;
        flow_l_min: number | null;
      }
    | undefined;
  const r = (await trx("readings")
    .where({ admission_id: admission.admissionId })
    .orderBy("taken_at", "desc")
    .first("spo2_pct", "taken_at")) as { spo2_pct: number; taken_at: Date } | undefined;
  return {
    settings: s
      ? {
          device: s.device,
          fio2: s.fio2,
          fio2Estimated: Boolean(s.fio2_estimated),
          peep: s.peep_cmh2o,
          flow: s.flow_l_min,
        }
      : null,
    latestSpo2: r ? { pct: r.spo2_pct, takenAt: new Date(r.taken_at).toISOString() } : null,
    order: order
      ? {
          id: order.id,
          band: order.spo2Band,
          fio2Max: order.limits.fio2Max,
          peepMax: order.limits.peepMax,
          flowMax: order.limits.flowMax,
        }
      : null,
  };
}

type Place = { unit_code: string; unit_name: string; time_zone: string; bed_label: string };

async function placeOf(trx: Knex.Transaction, bedId: number): Promise<Place> {
  return (await trx("beds as b")
    .join("units as u", "u.id", "b.unit_id")
    .where("b.id", bedId)
    .first(
      "u.code as unit_code",
      "u.name as unit_name",
      "u.time_zone",
      "b.label as bed_label",
    )) as Place;
}

/** Queues one request e-mail per recipient in the caller's transaction; a retry queues nothing new. */
export async function mailRequest(
  trx: Knex.Transaction,
  request: OrderRequestView,
  purpose: OrderRequestPurpose,
  recipients: readonly AlertRecipient[],
  now: Date,
  extra: { closedWords?: string; escalateMinutes?: number } = {},
): Promise<string[]> {
  const place = await placeOf(trx, request.bedId);
  const ids: string[] = [];
  for (const r of recipients) {
    ids.push(
      await queueUserMail(
        trx,
        ORDER_REQUEST_PURPOSES[purpose],
        r,
        ({ baseUrl, domain }) => ({
          ...composeOrderRequestEmail({
            requestId: request.id,
            purpose,
            requestedBy: request.requestedBy.name,
            need: request.need,
            reason: request.reason,
            snapshot: request.snapshot,
            unitCode: place.unit_code,
            unitName: place.unit_name,
            bedLabel: place.bed_label,
            timeZone: place.time_zone,
            askedAt: new Date(request.createdAt),
            asWho: purpose === "closed" ? "requester" : BASIS_WORDS[r.basis],
            baseUrl,
            ...extra,
          }),
          messageId: orderRequestMessageId(request.id, purpose, r.id ?? 0, domain),
        }),
        now,
        request.id,
      ),
    );
  }
  return ids;
}

/**
 * A therapist or nurse asks for a new order: the request goes to the shift's
 * responsible physician for the bed, else the prescriber of the order in
 * effect (then the charge nurse, then the unit's fallback address — the
 * alerts' recipients), with the settings and latest SpO2 attached, in one
 * transaction with its e-mail and ledger row.
 */
export async function sendOrderRequest(
  knex: Knex,
  actor: Actor,
  input: OrderRequestData,
  now: Date = new Date(),
  escalateAfterMs: number = orderRequestEscalateMs(),
): Promise<OrderRequestView> {
  const admission = await findOpenAdmission(knex, actor, input.patientId);
  if (input.alertId !== undefined) {
    const alert = (await knex("alerts")
      .where({ id: input.alertId, admission_id: admission.admissionId })
      .first("id")) as { id: number } | undefined;
    if (!alert)
      throw new ValidationError("Some fields need attention.", {
        alertId: ["Name an alert of this patient's current stay, or none."],
      });
  }
  return once(knex, actor.id, input.idempotencyKey, "order_request.send", async (trx) => {
    await lockPatientChain(trx, admission.patientId);
    const open = (await trx("order_requests as r")
      .join("users as u", "u.id", "r.requested_by")
      .where("r.admission_id", admission.admissionId)
      .whereNot("r.state", "closed")
      .first("r.id", "u.name")) as { id: number; name: string } | undefined;
    if (open)
      throw new ConflictError(
        `Order request #${open.id} from ${open.name} is still open for this patient; add to it by talking to the physician, or wait for the answer.`,
      );
    const snapshot = await takeSnapshot(trx, admission);
    const recipients = await recipientsFor(
      trx,
      { bedId: admission.bedId, unitId: admission.unitId, orderId: snapshot.order?.id ?? null },
      2,
      now,
    );
    const physician = recipients.find((r) => r.basis === "assigned" || r.basis === "prescriber");
    const told = recipients.map((r) => ({ name: r.name, basis: r.basis }));
    const [id] = await insertRequest(trx, {
      patient_id: admission.patientId,
      admission_id: admission.admissionId,
      unit_id: admission.unitId,
      bed_id: admission.bedId,
      order_id: snapshot.order?.id ?? null,
      alert_id: input.alertId ?? null,
      source: input.source,
      requested_by: actor.id,
      physician_id: physician?.id ?? null,
      recipient_basis: recipients[0]?.basis ?? null,
      need: input.need,
      reason: input.reason,
      device: input.device ?? null,
      fio2_max: input.fio2Max ?? null,
      peep_max_cmh2o: input.peepMax ?? null,
      flow_max_l_min: input.flowMax ?? null,
      snapshot_json: JSON.stringify(snapshot),
      state: "open",
      next_escalation_at: new Date(now.getTime() + escalateAfterMs),
      told_json: JSON.stringify([told]),
      created_at: now,
    }).catch((error: unknown) => {
      // Two asks at once for the same stay: the index keeps one open, the other is told.
      if (duplicateIndex(error) === "order_requests_open_admission_id_unique")
        throw new ConflictError(
          "Another order request for this patient was just sent; see it in Order requests.",
        );
      throw error;
    });
    const request = (await getOrderRequest(trx, Number(id)))!;
    const messageIds = await mailRequest(trx, request, "ask", recipients, now);
    await appendLedger(
      trx,
      actor,
      {
        action: "order_request.send",
        entityType: "order_request",
        entityId: request.id,
        patientId: admission.patientId,
        unitId: admission.unitId,
        after: { request, told, messageIds, notAssigned: recipients.length === 0 },
        rationale: input.reason,
      },
      now,
    );
    return request;
  });
}

const insertRequest = (trx: Knex.Transaction, row: Record<string, unknown>) =>
  trx("order_requests").insert(row) as Promise<number[]>;

/** Cancels a request's e-mail that has not left yet: nobody is asked for what is already answered. */
async function cancelRequestMail(trx: Knex.Transaction, requestId: number, now: Date) {
  return trx("mail_outbox")
    .where({ order_request_id: requestId, state: "pending" })
    .whereIn("purpose", [ORDER_REQUEST_PURPOSES.ask, ORDER_REQUEST_PURPOSES.escalate])
    .update({
      state: "cancelled",
      cancel_reason: `The request was closed at ${now.toISOString()} before this e-mail left.`,
      cancelled_at: now,
    });
}

/** Closes one locked request, tells its requester, and writes the ledger row. */
async function closeRequest(
  trx: Knex.Transaction,
  actor: Actor,
  before: OrderRequestView,
  how: { kind: "order"; orderId: number } | { kind: "reply"; reply: string },
  now: Date,
): Promise<OrderRequestView> {
  await trx("order_requests")
    .where({ id: before.id })
    .update({
      state: "closed",
      closed_at: now,
      closed_by: actor.id,
      closed_how: how.kind,
      closed_order_id: how.kind === "order" ? how.orderId : null,
      reply: how.kind === "reply" ? how.reply : null,
      next_escalation_at: null,
      version: before.version + 1,
    });
  const cancelled = await cancelRequestMail(trx, before.id, now);
  const after = (await getOrderRequest(trx, before.id))!;
  const words =
    how.kind === "order"
      ? `closed by order #${how.orderId}, signed by ${actor.name}`
      : `answered by ${actor.name}: ${how.reply}`;
  const requester = (await trx("users")
    .where({ id: before.requestedBy.id, active: true })
    .first("id", "email", "name")) as { id: number; email: string; name: string } | undefined;
  const mailed = requester
    ? await mailRequest(trx, after, "closed", [{ ...requester, basis: "assigned" }], now, {
        closedWords: words,
      })
    : [];
  await appendLedger(
    trx,
    actor,
    {
      action: how.kind === "order" ? "order_request.close" : "order_request.reply",
      entityType: "order_request",
      entityId: before.id,
      patientId: before.patientId,
      unitId: before.unitId,
      before: { state: before.state },
      after: {
        state: "closed",
        how: how.kind,
        ...(how.kind === "order" ? { orderId: how.orderId } : {}),
        requesterMail: mailed,
        mailCancelled: Number(cancelled),
      },
      rationale: how.kind === "reply" ? how.reply : `Order #${how.orderId} was signed.`,
    },
    now,
  );
  return after;
}

/**
 * A signed order closes the open request for the admission, inside the
 * order's own transaction (called by lib/orders/service).
 */
export async function closeRequestsByOrder(
  trx: Knex.Transaction,
  actor: Actor,
  admissionId: number,
  orderId: number,
  now: Date,
): Promise<number[]> {
  const ids = (await trx("order_requests")
    .where({ admission_id: admissionId })
    .whereNot({ state: "closed" })
    .forUpdate()
    .pluck("id")) as number[];
  for (const id of ids) {
    const before = (await getOrderRequest(trx, id))!;
    await closeRequest(trx, actor, before, { kind: "order", orderId }, now);
  }
  return ids;
}

/** A physician answers a request without an order, with the reason; it closes. */
export async function replyToOrderRequest(
  knex: Knex,
  actor: Actor,
  input: OrderRequestReplyData,
  now: Date = new Date(),
): Promise<OrderRequestView> {
  return transact(knex, async (trx) => {
    const found = (await trx("order_requests")
      .where({ id: input.requestId })
      .first("patient_id", "unit_id")) as { patient_id: number; unit_id: number } | undefined;
    if (!found || !actor.unitIds.includes(found.unit_id))
      throw new NotFoundError("No order request with that id on your units.");
    await lockPatientChain(trx, found.patient_id);
    await trx("order_requests").where({ id: input.requestId }).forUpdate().first("id");
    const before = (await getOrderRequest(trx, input.requestId))!;
    if (before.state === "closed")
      throw new ConflictError(
        `Order request #${before.id} is already closed (${before.closedWords ?? "closed"}).`,
      );
    return closeRequest(trx, actor, before, { kind: "reply", reply: input.reply }, now);
  });
}

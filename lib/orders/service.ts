import type { Knex } from "knex";
import type { Actor } from "../auth/actor";
import { confirmPassword } from "../auth/reauth";
import { ConflictError, ForbiddenError, NotFoundError, ValidationError } from "../errors";
import { once } from "../idempotency";
import { queueUserMail } from "../alerts/outbox";
import { afterOrderChanged } from "../alerts/service";
import { refreshFrom } from "../rollups/store";
import { appendLedger } from "../ledger/service";
import { duplicateIndex, isLockWaitTimeout } from "../db-errors";
import { findOpenAdmission, type OpenAdmission } from "../admissions/access";
import { DEVICE_PROFILES, stepTableFitsDevice, stepTableMismatchMessage } from "../devices";
import { DESIGNATED_COSIGN_MEANING, SIGNATURE_MEANING } from "./wording";
import { cosignersFor, cosignersText, mayCosign } from "./cosigners";
import { getCurrentOrder, getOrder, type OrderView } from "./queries";
import {
  type orderInputSchema,
  type CosignData,
  type DiscontinueData,
  type OrderData,
} from "./schema";
import {
  composeOrderSupersededEmail,
  ORDER_SUPERSEDED_PURPOSE,
  orderSupersededMessageId,
} from "./supersede-email";
import { can } from "../auth/permissions";
import type { Device } from "../devices";
import { parseDevices } from "../units/queries";
import { transact } from "../transaction";
import { applyStartingSettings } from "./starting-settings";
import { noticeOrderChange } from "../order-notices/service";
import { closeRequestsByOrder } from "../order-requests/service";
import { ventilatorColumns } from "./ventilator";

/** A unit allows only some devices (a ward that does not ventilate): an order for another is refused. */
async function assertUnitAllowsDevice(knex: Knex, unitId: number, device: Device): Promise<void> {
  const unit = (await knex("units").where({ id: unitId }).first("name", "devices_json")) as {
    name: string;
    devices_json: string | null;
  };
  if (parseDevices(unit.devices_json).includes(device)) return;
  const label = DEVICE_PROFILES[device].label;
  throw new ValidationError("Some fields need attention.", {
    device: [
      `${unit.name} does not allow ${label}. Choose another device, or move the patient to a unit that allows it.`,
    ],
  });
}

type ParsedOrder = ReturnType<typeof orderInputSchema.parse>;

/**
 * Writes an order. A physician's written order is signed (password re-asked)
 * and takes effect at once; a nurse's or therapist's verbal or telephone order,
 * read back, takes effect marked "awaiting co-sign" until a physician co-signs.
 * The order in effect before is superseded in the same transaction, and the
 * bedside settings start from the order's starting settings.
 */
/** `now` is injectable so the demo seed can replay a timeline; callers leave it out. */
export async function writeOrder(
  knex: Knex,
  actor: Actor,
  input: OrderData,
  now: Date = new Date(),
): Promise<OrderView> {
  if (can(actor, "order.sign") && input.entryMode !== "written") {
    throw new ValidationError("Physicians write and sign orders themselves.", {
      entryMode: [
        "Physicians write orders directly; verbal and telephone entry is for nurses and therapists.",
      ],
    });
  }
  if (!can(actor, "order.sign") && input.entryMode === "written") {
    throw new ValidationError("Only a physician can write and sign an order.", {
      entryMode: ["Enter it as a verbal or telephone order from the physician, with read-back."],
    });
  }
  const admission = await findOpenAdmission(knex, actor, input.patientId);
  await assertUnitAllowsDevice(knex, admission.unitId, input.device);
  // Before the password: a missing height is refused without spending a signature.
  const ventilator = await ventilatorColumns(knex, input);
  if (input.entryMode === "written") {
    await confirmPassword(knex, actor.id, input.password);
  } else {
    const prescriber = (await knex("users as u")
      .join("user_units as uu", "uu.user_id", "u.id")
      .where({
        "u.id": input.prescriberId,
        "u.role": "physician",
        "u.active": true,
        "uu.unit_id": admission.unitId,
      })
      .first("u.id")) as { id: number } | undefined;
    if (!prescriber) {
      throw new ValidationError("Some fields need attention.", {
        prescriberId: ["Choose an active physician of this patient's unit."],
      });
    }
  }
  if (input.stepTableId !== undefined) {
    const table = (await knex("step_tables")
      .where({ id: input.stepTableId, active: true })
      .andWhere((q) => {
        void q.whereNull("unit_id").orWhere("unit_id", admission.unitId);
      })
      .first("id", "name", "kind")) as
      { id: number; name: string; kind: "fio2_peep" | "flow_fio2" } | undefined;
    if (!table)
      throw new ValidationError("Some fields need attention.", {
        stepTableId: ["Choose a step table from this unit's library."],
      });
    // The composer offers only fitting tables; the API must refuse the rest too.
    if (!stepTableFitsDevice(table.kind, input.device))
      throw new ValidationError("Some fields need attention.", {
        stepTableId: [stepTableMismatchMessage(table, input.device)],
      });
  }

  return once(knex, actor.id, input.idempotencyKey, "order.write", async (trx) => {
    // Two writers who both saw "no order in effect" meet at the unique index
    // (a deadlock is not caught here: once() runs the victim again).
    return writeOrderInTransaction(trx, actor, input, ventilator, admission, now).catch(
      (error: unknown) => {
        if (
          duplicateIndex(error) === "orders_current_patient_id_unique" ||
          isLockWaitTimeout(error)
        ) {
          throw new ConflictError(
            "Another order was just written for this patient. Review it, then write yours again if it is still needed.",
          );
        }
        throw error;
      },
    );
  });
}

async function writeOrderInTransaction(
  trx: Knex.Transaction,
  actor: Actor,
  input: ParsedOrder,
  ventilator: Record<string, number | string | null>,
  admission: OpenAdmission,
  now: Date,
): Promise<OrderView> {
  const current = (await trx("orders")
    .where({ current_patient_id: input.patientId })
    .forUpdate()
    .first("id", "version", "status")) as
    { id: number; version: number; status: string } | undefined;
  if ((current?.id ?? null) !== input.supersedesOrderId) {
    const fresh = await getCurrentOrder(trx, input.patientId);
    throw new ConflictError(
      fresh
        ? `Another order (#${fresh.id}, by ${fresh.prescriber.name}) is now in effect for this patient. Review it, then write yours again if it is still needed.`
        : "The order you meant to replace is no longer in effect. Review the patient's current state, then write again.",
    );
  }
  const written = input.entryMode === "written";
  // The old order leaves effect first: one order in effect per patient is a unique index.
  const before = current ? await getOrder(trx, current.id) : null;
  if (current) {
    await trx("orders")
      .where({ id: current.id })
      .update({ status: "superseded", version: current.version + 1, updated_at: now });
  }
  const [orderId] = await trx("orders").insert({
    patient_id: input.patientId,
    admission_id: admission.admissionId,
    unit_id: admission.unitId,
    status: written ? "active" : "awaiting_cosign",
    device: input.device,
    spo2_lower_pct: input.spo2Lower,
    spo2_upper_pct: input.spo2Upper,
    pao2_lower_mmhg: input.pao2Lower ?? null,
    pao2_upper_mmhg: input.pao2Upper ?? null,
    fio2_min: input.fio2Min,
    fio2_max: input.fio2Max,
    peep_min_cmh2o: input.peepMin ?? null,
    peep_max_cmh2o: input.peepMax ?? null,
    flow_min_l_min: input.flowMin ?? null,
    flow_max_l_min: input.flowMax ?? null,
    initial_fio2: input.initialFio2,
    initial_peep_cmh2o: input.initialPeep ?? null,
    initial_flow_l_min: input.initialFlow ?? null,
    step_table_id: input.stepTableId ?? null,
    ...ventilator,
    reassess_minutes: input.reassessMinutes,
    rationale: input.rationale,
    entry_mode: input.entryMode,
    read_back_confirmed: !written,
    entered_by: actor.id,
    prescriber_id: written ? actor.id : input.prescriberId,
    signed_by: written ? actor.id : null,
    signed_at: written ? now : null,
    signature_meaning: written ? SIGNATURE_MEANING : null,
    created_at: now,
    updated_at: now,
  });
  const newId = Number(orderId);
  // A signed order replaced by a verbal or telephone one: its prescriber hears of it.
  const notice =
    before && before.signedBy && input.entryMode !== "written"
      ? await noticeToPrescriber(
          trx,
          actor,
          before,
          { id: newId, entryMode: input.entryMode, prescriberId: input.prescriberId },
          admission,
          now,
        )
      : null;
  if (current) {
    await trx("orders").where({ id: current.id }).update({ superseded_by_order_id: newId });
    await appendLedger(
      trx,
      actor,
      {
        action: "order.supersede",
        entityType: "order",
        entityId: current.id,
        patientId: input.patientId,
        unitId: admission.unitId,
        before,
        after: await getOrder(trx, current.id),
        rationale: `Superseded by order #${newId}${notice ? `; ${notice.words}` : ""}`,
      },
      now,
    );
  }
  const order = (await getOrder(trx, newId))!;
  const settings = await applyStartingSettings(trx, order, now);
  await appendLedger(
    trx,
    actor,
    {
      action: written ? "order.write" : "order.verbal",
      entityType: "order",
      entityId: newId,
      patientId: input.patientId,
      unitId: admission.unitId,
      after: {
        order,
        bedsideSettings: settings,
        ...(notice ? { supersededPrescriberNotice: notice.detail } : {}),
      },
      rationale: input.rationale,
    },
    now,
  );
  // The bed's nurse and therapist hear of it; a signed order answers an open request.
  const change = { order, before, bedId: admission.bedId, timeZone: admission.timeZone };
  await noticeOrderChange(trx, actor, { ...change, event: before ? "supersede" : "new" }, now);
  if (written) await closeRequestsByOrder(trx, actor, admission.admissionId, newId, now);
  await afterOrderChanged(trx, actor, admission, now);
  await refreshFrom(trx, admission.admissionId, now, now);
  return order;
}

/**
 * Queues the e-mail to the prescriber of a signed order that a verbal or
 * telephone order replaces, in the writer's transaction, and says what was
 * done for the ledger (a deactivated prescriber gets none).
 */
async function noticeToPrescriber(
  trx: Knex.Transaction,
  actor: Actor,
  replaced: OrderView,
  entered: { id: number; entryMode: "verbal" | "telephone"; prescriberId: number },
  admission: OpenAdmission,
  now: Date,
): Promise<{ words: string; detail: Record<string, unknown> }> {
  const recipient = (await trx("users")
    .where({ id: replaced.prescriber.id, active: true })
    .first("id", "email", "name")) as { id: number; email: string; name: string } | undefined;
  if (!recipient) {
    return {
      words: `its prescriber, ${replaced.prescriber.name}, is no longer active and was not e-mailed`,
      detail: { orderId: replaced.id, recipientUserId: replaced.prescriber.id, mailed: false },
    };
  }
  const where = (await trx("beds as b")
    .join("units as u", "u.id", "b.unit_id")
    .where("b.id", admission.bedId)
    .first("b.label", "u.code", "u.name")) as { label: string; code: string; name: string };
  const newPrescriber = (await trx("users").where({ id: entered.prescriberId }).first("name")) as {
    name: string;
  };
  const messageId = await queueUserMail(
    trx,
    ORDER_SUPERSEDED_PURPOSE,
    recipient,
    ({ baseUrl, domain }) => ({
      ...composeOrderSupersededEmail({
        oldOrderId: replaced.id,
        newOrderId: entered.id,
        entryMode: entered.entryMode,
        enteredBy: actor.name,
        newPrescriber: newPrescriber.name,
        fromRecipient: entered.prescriberId === recipient.id,
        unitCode: where.code,
        unitName: where.name,
        bedLabel: where.label,
        timeZone: admission.timeZone,
        at: now,
        baseUrl,
      }),
      messageId: orderSupersededMessageId(replaced.id, recipient.id, domain),
    }),
    now,
  );
  return {
    words: `its prescriber, ${recipient.name}, is e-mailed`,
    detail: { orderId: replaced.id, recipientUserId: recipient.id, mailed: true, messageId },
  };
}

async function lockOrder(
  trx: Knex.Transaction,
  actor: Actor,
  orderId: number,
  version: number,
): Promise<OrderView> {
  const row = (await trx("orders")
    .where({ id: orderId })
    .forUpdate()
    .first("id", "unit_id", "version")) as
    { id: number; unit_id: number; version: number } | undefined;
  if (!row || !actor.unitIds.includes(row.unit_id))
    throw new NotFoundError("No order with that id on your units.");
  const order = (await getOrder(trx, orderId))!;
  if (row.version !== version) {
    throw new ConflictError(
      `Order #${orderId} was changed by someone else (it is now ${order.status.replace("_", " ")}). Reload it and try again.`,
    );
  }
  return order;
}

/**
 * The prescriber named on a verbal or telephone order, or a physician its unit
 * designates, co-signs it; it becomes active.
 */
export async function cosignOrder(knex: Knex, actor: Actor, input: CosignData): Promise<OrderView> {
  await confirmPassword(knex, actor.id, input.password);
  return transact(knex, async (trx) => {
    const before = await lockOrder(trx, actor, input.orderId, input.version);
    if (before.status !== "awaiting_cosign") {
      throw new ConflictError(
        `Order #${before.id} is ${before.status.replace("_", " ")}, not awaiting co-signature.`,
      );
    }
    // The co-signature says the order is what its prescriber meant: only they,
    // or a physician the unit designates, may give it.
    const cosigners = await cosignersFor(trx, before);
    if (!mayCosign(actor.id, cosigners)) throw new ForbiddenError(cosignersText(cosigners));
    const now = new Date();
    await trx("orders")
      .where({ id: before.id })
      .update({
        status: "active",
        cosigned_by: actor.id,
        cosigned_at: now,
        signed_by: actor.id,
        signed_at: now,
        signature_meaning:
          actor.id === before.prescriber.id ? SIGNATURE_MEANING : DESIGNATED_COSIGN_MEANING,
        version: before.version + 1,
        updated_at: now,
      });
    const after = (await getOrder(trx, before.id))!;
    await appendLedger(
      trx,
      actor,
      {
        action: "order.cosign",
        entityType: "order",
        entityId: before.id,
        patientId: before.patientId,
        unitId: before.unitId,
        before,
        after,
        rationale:
          actor.id === before.prescriber.id
            ? `Co-signed ${before.entryMode} order entered by ${before.enteredBy.name}`
            : `Co-signed ${before.entryMode} order entered by ${before.enteredBy.name} from ${before.prescriber.name}, as a co-signer the unit designates`,
      },
      now,
    );
    // Now signed: it answers an open request for the patient.
    await closeRequestsByOrder(trx, actor, before.admissionId, before.id, now);
    return after;
  });
}

/** A physician discontinues the order in effect; a reason is required. */
export async function discontinueOrder(
  knex: Knex,
  actor: Actor,
  input: DiscontinueData,
): Promise<OrderView> {
  await confirmPassword(knex, actor.id, input.password);
  return transact(knex, async (trx) => {
    const before = await lockOrder(trx, actor, input.orderId, input.version);
    if (before.status !== "active" && before.status !== "awaiting_cosign") {
      throw new ConflictError(`Order #${before.id} is already ${before.status.replace("_", " ")}.`);
    }
    const now = new Date();
    await trx("orders")
      .where({ id: before.id })
      .update({
        status: "discontinued",
        discontinued_by: actor.id,
        discontinued_at: now,
        discontinue_reason: input.reason,
        version: before.version + 1,
        updated_at: now,
      });
    const after = (await getOrder(trx, before.id))!;
    await appendLedger(
      trx,
      actor,
      {
        action: "order.discontinue",
        entityType: "order",
        entityId: before.id,
        patientId: before.patientId,
        unitId: before.unitId,
        before,
        after,
        rationale: input.reason,
      },
      now,
    );
    const bed = (await trx("admissions as a")
      .join("beds as b", "b.id", "a.bed_id")
      .join("units as u", "u.id", "b.unit_id")
      .where("a.id", before.admissionId)
      .first("a.bed_id", "u.time_zone")) as { bed_id: number; time_zone: string };
    await noticeOrderChange(
      trx,
      actor,
      {
        event: "discontinue",
        order: after,
        before,
        bedId: bed.bed_id,
        timeZone: bed.time_zone,
        reason: input.reason,
      },
      now,
    );
    await afterOrderChanged(
      trx,
      actor,
      {
        admissionId: before.admissionId,
        patientId: before.patientId,
        unitId: before.unitId,
        bedId: bed.bed_id,
      },
      now,
    );
    await refreshFrom(trx, before.admissionId, now, now);
    return after;
  });
}

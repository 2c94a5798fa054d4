import type { Knex } from "knex";
import type { Actor } from "../auth/actor";
import { queueUserMail } from "../alerts/outbox";
import { NotFoundError } from "../errors";
import { appendLedger, lockPatientChain } from "../ledger/service";
import type { OrderView } from "../orders/queries";
import {
  composeOrderChangeEmail,
  ORDER_CHANGE_PURPOSE,
  orderChangeMessageId,
} from "../orders/supersede-email";
import { transact } from "../transaction";
import { describeOrderChange, type OrderChangeEvent } from "./words";

/** The e-mail choice the notices follow (a row of alert_email_preferences). */
export const ORDER_CHANGE_PREFERENCE = "order_change";

/**
 * Tells the bed's assigned nurse and therapist of this shift that its order
 * changed, inside the order's transaction: one notice per order, event and
 * person (a unique index; a retried transaction writes it once), an e-mail
 * unless they turned order-change e-mail off, and one ledger row. The writer
 * needs no notice: theirs is written as already read.
 */
export async function noticeOrderChange(
  trx: Knex.Transaction,
  actor: Actor,
  change: {
    event: OrderChangeEvent;
    order: OrderView;
    before: OrderView | null;
    bedId: number;
    timeZone: string;
    reason?: string;
  },
  now: Date,
): Promise<void> {
  const { order, event } = change;
  const team = (await trx("care_assignments as c")
    .join("users as u", "u.id", "c.user_id")
    .where({ "c.bed_id": change.bedId, "u.active": true })
    .whereIn("c.duty", ["nurse", "therapist"])
    .where("c.starts_at", "<=", now)
    .where("c.ends_at", ">", now)
    .select("u.id", "u.email", "u.name", "c.duty")) as {
    id: number;
    email: string;
    name: string;
    duty: "nurse" | "therapist";
  }[];
  if (!team.length) return;
  const words = describeOrderChange(event, order, change.before, change.reason);
  const optedOut = (await trx("alert_email_preferences")
    .whereIn(
      "user_id",
      team.map((p) => p.id),
    )
    .where({ kind: ORDER_CHANGE_PREFERENCE, email: false })
    .pluck("user_id")) as number[];
  const place = (await trx("beds as b")
    .join("units as u", "u.id", "b.unit_id")
    .where("b.id", change.bedId)
    .first("b.label", "u.code", "u.name")) as { label: string; code: string; name: string };
  const told: { userId: number; duty: string; mailed: boolean }[] = [];
  for (const person of team) {
    const self = person.id === actor.id;
    const mail = !self && !optedOut.includes(person.id);
    const inserted = await trx("order_notices")
      .insert({
        order_id: order.id,
        event,
        patient_id: order.patientId,
        admission_id: order.admissionId,
        unit_id: order.unitId,
        bed_id: change.bedId,
        user_id: person.id,
        duty: person.duty,
        words,
        mailed: mail,
        created_at: now,
        read_at: self ? now : null,
      })
      .onConflict()
      .ignore();
    // Someone holding two duties on the bed gets one notice: the first insert wins.
    if (!inserted.length || inserted[0] === 0) continue;
    if (mail)
      await queueUserMail(
        trx,
        ORDER_CHANGE_PURPOSE,
        person,
        ({ baseUrl, domain }) => ({
          ...composeOrderChangeEmail({
            orderId: order.id,
            event,
            words,
            by: actor.name,
            duty: person.duty,
            unitCode: place.code,
            unitName: place.name,
            bedLabel: place.label,
            timeZone: change.timeZone,
            at: now,
            baseUrl,
          }),
          messageId: orderChangeMessageId(order.id, event, person.id, domain),
        }),
        now,
      );
    told.push({ userId: person.id, duty: person.duty, mailed: mail });
  }
  if (!told.length) return;
  await appendLedger(
    trx,
    actor,
    {
      action: "order.notice",
      entityType: "order",
      entityId: order.id,
      patientId: order.patientId,
      unitId: order.unitId,
      after: { event, words, told, optedOut },
    },
    now,
  );
}

export type OrderReadResult = { orderId: number; readAt: string | null; marked: number };

/**
 * The caller has read the change of an order: their unread notices of it are
 * marked read with one ledger row. Reading again changes nothing.
 */
export async function readOrderChange(
  knex: Knex,
  actor: Actor,
  input: { orderId: number },
  now: Date = new Date(),
): Promise<OrderReadResult> {
  return transact(knex, async (trx) => {
    const order = (await trx("orders")
      .where({ id: input.orderId })
      .first("id", "patient_id", "unit_id")) as
      { id: number; patient_id: number; unit_id: number } | undefined;
    if (!order || !actor.unitIds.includes(order.unit_id))
      throw new NotFoundError("No order with that id on your units.");
    await lockPatientChain(trx, order.patient_id);
    const unread = (await trx("order_notices")
      .where({ order_id: order.id, user_id: actor.id })
      .whereNull("read_at")
      .forUpdate()
      .select("id", "event")) as { id: number; event: OrderChangeEvent }[];
    if (!unread.length) {
      const last = (await trx("order_notices")
        .where({ order_id: order.id, user_id: actor.id })
        .max({ at: "read_at" })
        .first()) as { at: Date | null } | undefined;
      return {
        orderId: order.id,
        readAt: last?.at ? new Date(last.at).toISOString() : null,
        marked: 0,
      };
    }
    await trx("order_notices")
      .whereIn(
        "id",
        unread.map((n) => n.id),
      )
      .update({ read_at: now });
    await appendLedger(
      trx,
      actor,
      {
        action: "order.read",
        entityType: "order",
        entityId: order.id,
        patientId: order.patient_id,
        unitId: order.unit_id,
        after: { events: unread.map((n) => n.event), readAt: now.toISOString() },
      },
      now,
    );
    return { orderId: order.id, readAt: now.toISOString(), marked: unread.length };
  });
}

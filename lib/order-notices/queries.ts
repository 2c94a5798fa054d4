import type { Knex } from "knex";
import type { Actor } from "../auth/actor";
import type { OrderChangeEvent } from "./words";

export type OrderNoticeView = {
  id: number;
  orderId: number;
  event: OrderChangeEvent;
  patientId: number;
  unitCode: string;
  bedLabel: string;
  duty: "nurse" | "therapist";
  words: string;
  createdAt: string;
};

/** The caller's order-change notices not yet read, on their units, newest first. */
export async function unreadOrderNotices(
  knex: Knex,
  actor: Actor,
  limit = 50,
): Promise<OrderNoticeView[]> {
  if (!actor.unitIds.length) return [];
  const rows = (await knex("order_notices as n")
    .join("beds as b", "b.id", "n.bed_id")
    .join("units as u", "u.id", "n.unit_id")
    .where("n.user_id", actor.id)
    .whereNull("n.read_at")
    .whereIn("n.unit_id", actor.unitIds)
    .orderBy("n.created_at", "desc")
    .limit(limit)
    .select(
      "n.id",
      "n.order_id",
      "n.event",
      "n.patient_id",
      "u.code as unit_code",
      "b.label as bed_label",
      "n.duty",
      "n.words",
      "n.created_at",
    )) as {
    id: number;
    order_id: number;
    event: OrderChangeEvent;
    patient_id: number;
    unit_code: string;
    bed_label: string;
    duty: "nurse" | "therapist";
    words: string;
    created_at: Date;
  }[];
  return rows.map((r) => ({
    id: r.id,
    orderId: r.order_id,
    event: r.event,
    patientId: r.patient_id,
    unitCode: r.unit_code,
    bedLabel: r.bed_label,
    duty: r.duty,
    words: r.words,
    createdAt: new Date(r.created_at).toISOString(),
  }));
}

/**
 * Of the given (admission, current order, assigned nurse) triples, the
 * admissions whose nurse has an unread notice of that order: the Board's mark.
 */
export async function unreadByNurse(
  knex: Knex,
  beds: readonly { admissionId: number; orderId: number; nurseId: number }[],
): Promise<Set<number>> {
  if (!beds.length) return new Set();
  const rows = (await knex("order_notices")
    .whereNull("read_at")
    .whereIn(
      ["admission_id", "order_id", "user_id"],
      beds.map((b) => [b.admissionId, b.orderId, b.nurseId]),
    )
    .distinct("admission_id")) as { admission_id: number }[];
  return new Set(rows.map((r) => r.admission_id));
}

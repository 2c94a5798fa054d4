import type { Knex } from "knex";
import { ESCALATION_DUTIES } from "./kinds";

export type Recipient = { id: number; email: string; name: string };

/** Why a recipient was chosen: the bed's assignment first, never nobody if the unit has a fallback. */
export type RecipientBasis = "assigned" | "prescriber" | "charge" | "fallback";

/** An alert's recipient; the unit's fallback address has no user behind it. */
export type AlertRecipient = {
  id: number | null;
  email: string;
  name: string;
  basis: RecipientBasis;
};

/**
 * Who an escalation level reaches now: the shift's care-team assignment for
 * the bed (nurse, therapist, physician); for the physician level, the order's
 * prescriber when no physician is assigned; then the unit's charge nurse of
 * the shift; then the unit's fallback address. Empty only when the unit has
 * none of these.
 */
export async function recipientsFor(
  trx: Knex.Transaction | Knex,
  alert: { bedId: number; unitId: number; orderId: number | null },
  level: number,
  now: Date,
): Promise<AlertRecipient[]> {
  const duty = ESCALATION_DUTIES[Math.min(level, 2)]!;
  const people = (rows: Recipient[], basis: RecipientBasis) =>
    rows.map((r) => ({ id: r.id, email: r.email, name: r.name, basis }));
  const assigned = (await trx("care_assignments as c")
    .join("users as u", "u.id", "c.user_id")
    .where({ "c.bed_id": alert.bedId, "c.duty": duty, "u.active": true })
    .where("c.starts_at", "<=", now)
    .where("c.ends_at", ">", now)
    .distinct("u.id", "u.email", "u.name")) as Recipient[];
  if (assigned.length) return people(assigned, "assigned");
  if (duty === "physician" && alert.orderId !== null) {
    const prescriber = (await trx("orders as o")
      .join("users as u", "u.id", "o.prescriber_id")
      .where({ "o.id": alert.orderId, "u.active": true })
      .select("u.id", "u.email", "u.name")) as Recipient[];
    if (prescriber.length) return people(prescriber, "prescriber");
  }
  return unitCover(trx, alert.unitId, now);
}

/**
 * Who covers a unit when nobody is assigned: its charge nurse of the shift,
 * else its fallback address. Empty only when the unit has neither.
 */
export async function unitCover(
  trx: Knex.Transaction | Knex,
  unitId: number,
  now: Date,
): Promise<AlertRecipient[]> {
  const people = (rows: Recipient[], basis: RecipientBasis) =>
    rows.map((r) => ({ id: r.id, email: r.email, name: r.name, basis }));
  const charge = (await trx("unit_charge_duties as d")
    .join("users as u", "u.id", "d.user_id")
    .where({ "d.unit_id": unitId, "u.active": true })
    .where("d.starts_at", "<=", now)
    .where("d.ends_at", ">", now)
    .select("u.id", "u.email", "u.name")) as Recipient[];
  if (charge.length) return people(charge, "charge");
  const unit = (await trx("units").where({ id: unitId }).first("code", "fallback_email")) as
    { code: string; fallback_email: string | null } | undefined;
  if (unit?.fallback_email) {
    return [
      {
        id: null,
        email: unit.fallback_email,
        name: `${unit.code} fallback address`,
        basis: "fallback",
      },
    ];
  }
  return [];
}

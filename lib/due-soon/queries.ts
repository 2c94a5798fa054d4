import type { Knex } from "knex";
import type { Actor } from "../auth/actor";
import { reassessmentDueAt, reassessmentDueSoonMinutes } from "../alerts/due";

/** Reassessments coming due within this many minutes are "due soon". */
export const DUE_SOON_MINUTES = 60;

export type DueSoonBed = {
  patientId: number;
  unitCode: string;
  bedLabel: string;
  duty: "nurse" | "therapist";
  orderId: number;
  reassessMinutes: number;
  lastReassessedAt: string;
  dueAt: string;
  minutesLeft: number;
};

/**
 * The caller's beds this shift (as nurse or therapist) whose reassessment
 * falls due within the next hour and is not overdue yet — the same due time
 * the overdue sweep uses (lib/alerts/due.ts). Soonest first.
 */
export async function dueSoon(
  knex: Knex,
  actor: Actor,
  now: Date = new Date(),
  windowMinutes = DUE_SOON_MINUTES,
): Promise<DueSoonBed[]> {
  if (!actor.unitIds.length) return [];
  const rows = (await knex("care_assignments as c")
    .join("beds as b", "b.id", "c.bed_id")
    .join("units as u", "u.id", "b.unit_id")
    .join("admissions as a", function () {
      this.on("a.bed_id", "b.id").andOnNull("a.discharged_at");
    })
    .join("orders as o", "o.current_patient_id", "a.patient_id")
    .join("bedside_settings as s", "s.admission_id", "a.id")
    .where("c.user_id", actor.id)
    .whereIn("c.duty", ["nurse", "therapist"])
    .whereIn("b.unit_id", actor.unitIds)
    .where("c.starts_at", "<=", now)
    .where("c.ends_at", ">", now)
    .select(
      "a.patient_id",
      "u.code as unit_code",
      "b.label as bed_label",
      "c.duty",
      "o.id as order_id",
      "o.reassess_minutes",
      "s.last_reassessed_at",
    )) as {
    patient_id: number;
    unit_code: string;
    bed_label: string;
    duty: "nurse" | "therapist";
    order_id: number;
    reassess_minutes: number;
    last_reassessed_at: Date;
  }[];
  const out: DueSoonBed[] = [];
  for (const r of rows) {
    const last = new Date(r.last_reassessed_at).getTime();
    const left = reassessmentDueSoonMinutes(last, r.reassess_minutes, now.getTime(), windowMinutes);
    if (left === null) continue;
    // A bed held under two duties is listed once.
    if (out.some((o) => o.patientId === r.patient_id)) continue;
    out.push({
      patientId: r.patient_id,
      unitCode: r.unit_code,
      bedLabel: r.bed_label,
      duty: r.duty,
      orderId: r.order_id,
      reassessMinutes: r.reassess_minutes,
      lastReassessedAt: new Date(last).toISOString(),
      dueAt: new Date(reassessmentDueAt(last, r.reassess_minutes)).toISOString(),
      minutesLeft: left,
    });
  }
  return out.sort((a, b) => a.dueAt.localeCompare(b.dueAt));
}

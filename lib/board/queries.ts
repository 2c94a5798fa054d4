import type { Knex } from "knex";
import { ageInYears, initialsOf } from "../patients/display";

export type BoardRow = {
  bedId: number;
  bedLabel: string;
  unitId: number;
  unitCode: string;
  patientId: number;
  patientInitials: string;
  patientAge: number;
  sex: "female" | "male";
  admittedAt: string;
  nurse: string | null;
  therapist: string | null;
};

export type BoardUnit = {
  unitId: number;
  unitCode: string;
  unitName: string;
  totalBeds: number;
  occupiedBeds: number;
};

/**
 * The occupied beds of the given units with who is looking after each bed this
 * shift. Callers pass only units the actor is assigned to.
 */
export async function listOccupiedBeds(
  knex: Knex,
  unitIds: readonly number[],
  now: Date = new Date(),
): Promise<BoardRow[]> {
  if (unitIds.length === 0) return [];
  const rows = (await knex("admissions as a")
    .join("beds as b", "b.id", "a.bed_id")
    .join("units as u", "u.id", "b.unit_id")
    .join("patients as p", "p.id", "a.patient_id")
    .whereNull("a.discharged_at")
    .whereIn("b.unit_id", unitIds)
    .orderBy([{ column: "u.code" }, { column: "b.sort_order" }])
    .select(
      "b.id as bed_id",
      "b.label as bed_label",
      "u.id as unit_id",
      "u.code as unit_code",
      "p.id as patient_id",
      "p.family_name",
      "p.given_name",
      "p.birth_date",
      "p.sex",
      "a.admitted_at",
    )) as {
    bed_id: number;
    bed_label: string;
    unit_id: number;
    unit_code: string;
    patient_id: number;
    family_name: string;
    given_name: string;
    birth_date: Date;
    sex: "female" | "male";
    admitted_at: Date;
  }[];
  const bedIds = rows.map((r) => r.bed_id);
  const carers = bedIds.length
    ? ((await knex("care_assignments as c")
        .join("users as s", "s.id", "c.user_id")
        .whereIn("c.bed_id", bedIds)
        .where("c.starts_at", "<=", now)
        .where("c.ends_at", ">", now)
        .select("c.bed_id", "c.duty", "s.name")) as { bed_id: number; duty: string; name: string }[])
    : [];
  const carer = (bedId: number, duty: string) =>
    carers.find((c) => c.bed_id === bedId && c.duty === duty)?.name ?? null;
  return rows.map((r) => ({
    bedId: r.bed_id,
    bedLabel: r.bed_label,
    unitId: r.unit_id,
    unitCode: r.unit_code,
    patientId: r.patient_id,
    patientInitials: initialsOf(r.given_name, r.family_name),
    patientAge: ageInYears(r.birth_date, now),
    sex: r.sex,
    admittedAt: r.admitted_at.toISOString(),
    nurse: carer(r.bed_id, "nurse"),
    therapist: carer(r.bed_id, "therapist"),
  }));
}

/** Bed counts per unit, for the Board's header line and empty states. */
export async function summariseUnits(knex: Knex, unitIds: readonly number[]): Promise<BoardUnit[]> {
  if (unitIds.length === 0) return [];
  const rows = (await knex("units as u")
    .leftJoin("beds as b", function joinBeds() {
      this.on("b.unit_id", "=", "u.id").andOn("b.active", "=", knex.raw("1"));
    })
    .leftJoin("admissions as a", function joinOpen() {
      this.on("a.bed_id", "=", "b.id").andOnNull("a.discharged_at");
    })
    .whereIn("u.id", unitIds)
    .groupBy("u.id", "u.code", "u.name")
    .orderBy("u.code")
    .select("u.id", "u.code", "u.name")
    .countDistinct({ total: "b.id" })
    .countDistinct({ occupied: "a.id" })) as {
    id: number;
    code: string;
    name: string;
    total: number | string;
    occupied: number | string;
  }[];
  return rows.map((r) => ({
    unitId: r.id,
    unitCode: r.code,
    unitName: r.name,
    totalBeds: Number(r.total),
    occupiedBeds: Number(r.occupied),
  }));
}

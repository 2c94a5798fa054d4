import type { Knex } from "knex";
import type { Actor } from "../auth/actor";
import { NotFoundError } from "../errors";

export type OpenAdmission = {
  admissionId: number;
  patientId: number;
  bedId: number;
  unitId: number;
  altitudeM: number;
  /** The unit's time zone: times are typed and shown on its clock. */
  timeZone: string;
  /** Set only by findReadableAdmission, for a discharged patient's Chart. */
  dischargedAt: Date | null;
};

/**
 * The patient's open admission, if it is on one of the actor's units. Any
 * other case answers "not found", so another unit's patients do not leak.
 */
export async function findOpenAdmission(
  knex: Knex,
  actor: Actor,
  patientId: number,
): Promise<OpenAdmission> {
  return findAdmission(knex, actor, patientId, false);
}

/**
 * For reading a Chart: the open admission, or else the patient's latest
 * discharged one on the actor's units, so records stay readable after
 * discharge. Writes keep asking findOpenAdmission.
 */
export async function findReadableAdmission(
  knex: Knex,
  actor: Actor,
  patientId: number,
): Promise<OpenAdmission> {
  return findAdmission(knex, actor, patientId, true);
}

async function findAdmission(
  knex: Knex,
  actor: Actor,
  patientId: number,
  orDischarged: boolean,
): Promise<OpenAdmission> {
  const q = knex("admissions as a")
    .join("beds as b", "b.id", "a.bed_id")
    .join("units as u", "u.id", "b.unit_id")
    .where("a.patient_id", patientId);
  if (orDischarged) {
    q.whereIn("u.id", actor.unitIds.length ? actor.unitIds : [0]).orderByRaw(
      "a.discharged_at IS NULL DESC, a.id DESC",
    );
  } else q.whereNull("a.discharged_at");
  const row = (await q.first(
    "a.id as admission_id",
    "a.patient_id",
    "b.id as bed_id",
    "u.id as unit_id",
    "u.altitude_m",
    "u.time_zone",
    "a.discharged_at",
  )) as
    | {
        admission_id: number;
        patient_id: number;
        bed_id: number;
        unit_id: number;
        altitude_m: number;
        time_zone: string;
        discharged_at: Date | null;
      }
    | undefined;
  if (!row || !actor.unitIds.includes(row.unit_id)) {
    throw new NotFoundError("No admitted patient with that id on your units.");
  }
  return {
    admissionId: row.admission_id,
    patientId: row.patient_id,
    bedId: row.bed_id,
    unitId: row.unit_id,
    altitudeM: row.altitude_m,
    timeZone: row.time_zone,
    dischargedAt: row.discharged_at,
  };
}

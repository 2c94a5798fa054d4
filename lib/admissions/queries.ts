import type { Knex } from "knex";
import type { Actor } from "../auth/actor";
import { NotFoundError } from "../errors";

/** A patient as the Chart shows them: who, and where they lie now. */
export type ChartPatient = {
  id: number;
  mrn: string;
  familyName: string;
  givenName: string;
  birthDate: Date;
  sex: "female" | "male";
  heightCm: number | null;
  admission: {
    id: number;
    admittedAt: Date;
    /** Set once discharged: the Chart is then read-only. */
    dischargedAt: Date | null;
    disposition: string | null;
    bed: { id: number; label: string };
    unit: { id: number; code: string; name: string; altitudeM: number; timeZone: string };
  };
};

/**
 * One patient with their open admission — or, once discharged, their latest
 * admission — for an actor of that admission's unit. A patient who does not
 * exist or lies on another unit is the same NotFoundError, so the answer does
 * not reveal which.
 */
export async function getPatientForActor(
  knex: Knex,
  actor: Pick<Actor, "unitIds">,
  patientId: number,
): Promise<ChartPatient> {
  if (actor.unitIds.length === 0) throw new NotFoundError();
  const row = (await knex("patients as p")
    .join("admissions as a", "a.patient_id", "p.id")
    .join("beds as b", "b.id", "a.bed_id")
    .join("units as u", "u.id", "b.unit_id")
    .where("p.id", patientId)
    .whereIn("u.id", actor.unitIds)
    .orderByRaw("a.discharged_at IS NULL DESC, a.id DESC")
    .first(
      "p.id",
      "p.mrn",
      "p.family_name",
      "p.given_name",
      "p.birth_date",
      "p.sex",
      "p.height_cm",
      "a.id as admission_id",
      "a.admitted_at",
      "a.discharged_at",
      "a.discharge_disposition",
      "b.id as bed_id",
      "b.label as bed_label",
      "u.id as unit_id",
      "u.code as unit_code",
      "u.name as unit_name",
      "u.altitude_m",
      "u.time_zone",
    )) as
    | {
        id: number;
        mrn: string;
        family_name: string;
        given_name: string;
        birth_date: Date;
        sex: "female" | "male";
        height_cm: number | null;
        admission_id: number;
        admitted_at: Date;
        discharged_at: Date | null;
        discharge_disposition: string | null;
        bed_id: number;
        bed_label: string;
        unit_id: number;
        unit_code: string;
        unit_name: string;
        altitude_m: number;
        time_zone: string;
      }
    | undefined;
  if (!row) throw new NotFoundError();
  return {
    id: row.id,
    mrn: row.mrn,
    familyName: row.family_name,
    givenName: row.given_name,
    birthDate: row.birth_date,
    sex: row.sex,
    heightCm: row.height_cm === null ? null : Number(row.height_cm),
    admission: {
      id: row.admission_id,
      admittedAt: row.admitted_at,
      dischargedAt: row.discharged_at,
      disposition: row.discharge_disposition,
      bed: { id: row.bed_id, label: row.bed_label },
      unit: {
        id: row.unit_id,
        code: row.unit_code,
        name: row.unit_name,
        altitudeM: row.altitude_m,
        timeZone: row.time_zone,
      },
    },
  };
}

/** The patient of one admission, open or closed, as an order's heading names them. */
export type AdmissionPatient = {
  patientId: number;
  mrn: string;
  familyName: string;
  givenName: string;
  bed: { id: number; label: string };
  unit: { id: number; code: string };
  dischargedAt: Date | null;
};

/**
 * Who lay where during one admission, discharged or not, for an actor of the
 * bed's unit. Another unit's admission is the same NotFoundError as none.
 */
export async function getAdmissionPatient(
  knex: Knex,
  actor: Actor,
  admissionId: number,
): Promise<AdmissionPatient> {
  if (actor.unitIds.length === 0) throw new NotFoundError();
  const row = (await knex("admissions as a")
    .join("patients as p", "p.id", "a.patient_id")
    .join("beds as b", "b.id", "a.bed_id")
    .join("units as u", "u.id", "b.unit_id")
    .where("a.id", admissionId)
    .whereIn("u.id", actor.unitIds)
    .first(
      "p.id as patient_id",
      "p.mrn",
      "p.family_name",
      "p.given_name",
      "b.id as bed_id",
      "b.label as bed_label",
      "u.id as unit_id",
      "u.code as unit_code",
      "a.discharged_at",
    )) as
    | {
        patient_id: number;
        mrn: string;
        family_name: string;
        given_name: string;
        bed_id: number;
        bed_label: string;
        unit_id: number;
        unit_code: string;
        discharged_at: Date | null;
      }
    | undefined;
  if (!row) throw new NotFoundError();
  return {
    patientId: row.patient_id,
    mrn: row.mrn,
    familyName: row.family_name,
    givenName: row.given_name,
    bed: { id: row.bed_id, label: row.bed_label },
    unit: { id: row.unit_id, code: row.unit_code },
    dischargedAt: row.discharged_at,
  };
}

/** One hit of the header's patient search. */
export type PatientHit = {
  patientId: number;
  admissionId: number;
  mrn: string;
  name: string;
  bedLabel: string;
  unitCode: string;
  /** Set for a patient no longer admitted (their records stay readable). */
  dischargedAt: string | null;
};

const likeEscape = (s: string) => s.replace(/[\\%_]/g, (c) => `\\${c}`);

/**
 * Patients of the actor's units by MRN (prefix), name (part) or bed label
 * (exact): each patient's latest admission there, those in a bed first.
 */
export async function searchPatients(
  knex: Knex,
  actor: Pick<Actor, "unitIds">,
  query: string,
  limit = 20,
): Promise<PatientHit[]> {
  if (actor.unitIds.length === 0) return [];
  const q = query.trim();
  const part = `%${likeEscape(q)}%`;
  const latest = knex("admissions as l").max("l.id").where("l.patient_id", knex.ref("p.id"));
  const rows = (await knex("patients as p")
    .join("admissions as a", "a.patient_id", "p.id")
    .join("beds as b", "b.id", "a.bed_id")
    .join("units as u", "u.id", "b.unit_id")
    .whereIn("u.id", actor.unitIds)
    .where("a.id", latest)
    .where((w) => {
      void w
        .where("p.mrn", "like", `${likeEscape(q.toUpperCase())}%`)
        .orWhere("p.family_name", "like", part)
        .orWhere("p.given_name", "like", part)
        .orWhereRaw("CONCAT(p.given_name, ' ', p.family_name) LIKE ?", [part])
        .orWhere((bed) => {
          void bed.where("b.label", q).whereNull("a.discharged_at");
        });
    })
    .orderByRaw("a.discharged_at IS NOT NULL, p.family_name, p.given_name")
    .limit(limit)
    .select(
      "p.id as patient_id",
      "a.id as admission_id",
      "p.mrn",
      "p.family_name",
      "p.given_name",
      "b.label as bed_label",
      "u.code as unit_code",
      "a.discharged_at",
    )) as {
    patient_id: number;
    admission_id: number;
    mrn: string;
    family_name: string;
    given_name: string;
    bed_label: string;
    unit_code: string;
    discharged_at: Date | null;
  }[];
  return rows.map((r) => ({
    patientId: r.patient_id,
    admissionId: r.admission_id,
    mrn: r.mrn,
    name: `${r.family_name}, ${r.given_name}`,
    bedLabel: r.bed_label,
    unitCode: r.unit_code,
    dischargedAt: r.discharged_at ? new Date(r.discharged_at).toISOString() : null,
  }));
}

import type { Knex } from "knex";
import { duplicateIndex } from "../db-errors";
import { ConflictError, NotFoundError, ValidationError } from "../errors";
import type { PatientDetails } from "./schema";

// The records an admission write stands on, read and checked: beds, the
// admission with its patient, the patient found by MRN (or registered), and
// the words for the open-admission indexes.

/** What an admit, transfer or discharge answers: the admission as it now stands. */
export type AdmissionView = {
  admissionId: number;
  patientId: number;
  mrn: string;
  name: string;
  bed: { id: number; label: string };
  unit: { id: number; code: string; name: string };
  admittedAt: string;
  dischargedAt: string | null;
  disposition: string | null;
  /** Admit only: the MRN was already known, so the stored patient was admitted again. */
  returning?: boolean;
};

/** The units a write may touch (a user's, or an API token's). */
type Scope = { unitIds: number[] };

export type BedRow = {
  bed_id: number;
  bed_label: string;
  bed_active: number | boolean;
  unit_id: number;
  unit_code: string;
  unit_name: string;
  unit_active: number | boolean;
  devices_json: string | null;
};

/** A bed of one of the doer's active units, by id or by unit code and label; any other is "not found". */
export async function bedFor(
  knex: Knex,
  doer: Scope,
  where: { bedId: number } | { unitCode: string; bedLabel: string },
): Promise<BedRow> {
  const q = knex("beds as b").join("units as u", "u.id", "b.unit_id");
  if ("bedId" in where) q.where("b.id", where.bedId);
  else q.where({ "u.code": where.unitCode, "b.label": where.bedLabel });
  const row = (await q.first(
    "b.id as bed_id",
    "b.label as bed_label",
    "b.active as bed_active",
    "u.id as unit_id",
    "u.code as unit_code",
    "u.name as unit_name",
    "u.active as unit_active",
    "u.devices_json",
  )) as BedRow | undefined;
  if (!row || !doer.unitIds.includes(row.unit_id) || !row.unit_active) {
    throw new NotFoundError(
      "bedId" in where
        ? "No bed with that id on your units."
        : `No bed ${where.bedLabel} on unit ${where.unitCode} of this token's units.`,
    );
  }
  if (!row.bed_active) {
    throw new ValidationError("Some fields need attention.", {
      bedId: [`Bed ${row.bed_label} is retired; choose another bed.`],
    });
  }
  return row;
}

type AdmissionRow = {
  id: number;
  patient_id: number;
  bed_id: number;
  admitted_at: Date;
  discharged_at: Date | null;
  discharge_disposition: string | null;
};

/** The admission with its patient, bed and unit, for an actor of the bed's unit. */
export async function admissionView(knex: Knex, admissionId: number): Promise<AdmissionView> {
  const r = (await knex("admissions as a")
    .join("patients as p", "p.id", "a.patient_id")
    .join("beds as b", "b.id", "a.bed_id")
    .join("units as u", "u.id", "b.unit_id")
    .where("a.id", admissionId)
    .first(
      "a.id",
      "a.patient_id",
      "a.admitted_at",
      "a.discharged_at",
      "a.discharge_disposition",
      "p.mrn",
      "p.family_name",
      "p.given_name",
      "b.id as bed_id",
      "b.label as bed_label",
      "u.id as unit_id",
      "u.code as unit_code",
      "u.name as unit_name",
    )) as AdmissionRow & {
    mrn: string;
    family_name: string;
    given_name: string;
    bed_label: string;
    unit_id: number;
    unit_code: string;
    unit_name: string;
  };
  return {
    admissionId: r.id,
    patientId: r.patient_id,
    mrn: r.mrn,
    name: `${r.family_name}, ${r.given_name}`,
    bed: { id: r.bed_id, label: r.bed_label },
    unit: { id: r.unit_id, code: r.unit_code, name: r.unit_name },
    admittedAt: new Date(r.admitted_at).toISOString(),
    dischargedAt: r.discharged_at ? new Date(r.discharged_at).toISOString() : null,
    disposition: r.discharge_disposition,
  };
}

/** An open admission on one of the doer's units, by id or by the patient's MRN; else "not found". */
export async function openAdmissionFor(
  knex: Knex,
  doer: Scope,
  where: { admissionId: number } | { mrn: string },
): Promise<AdmissionView> {
  const found = (await ("admissionId" in where
    ? knex("admissions").where({ id: where.admissionId }).first("id")
    : knex("admissions as a")
        .join("patients as p", "p.id", "a.patient_id")
        .where("p.mrn", where.mrn)
        .orderByRaw("a.discharged_at IS NULL DESC, a.id DESC")
        .first("a.id"))) as { id: number } | undefined;
  const view = found ? await admissionView(knex, found.id) : null;
  if (!view || !doer.unitIds.includes(view.unit.id)) {
    throw new NotFoundError(
      "admissionId" in where
        ? "No admission with that id on your units."
        : `No patient with MRN ${where.mrn} is admitted on this token's units.`,
    );
  }
  if (view.dischargedAt) {
    throw new ConflictError(
      `${view.name} was discharged on ${view.dischargedAt.slice(0, 16).replace("T", " ")} UTC; the stay can no longer be changed.`,
    );
  }
  return view;
}

/** The admission row locked, refusing one that was discharged meanwhile. */
export async function lockOpenAdmission(
  trx: Knex.Transaction,
  admissionId: number,
): Promise<AdmissionRow> {
  const row = (await trx("admissions")
    .where({ id: admissionId })
    .forUpdate()
    .first()) as AdmissionRow;
  if (row.discharged_at) {
    throw new ConflictError("The patient was discharged by someone else a moment ago.");
  }
  return row;
}

/** An event time given by the user: not in the future, not before `earliest`. */
export function checkEventTime(
  field: string,
  label: string,
  at: Date | undefined,
  now: Date,
  earliest: Date,
): Date {
  if (!at) return now;
  if (at.getTime() > now.getTime() + 5 * 60_000 || at.getTime() < earliest.getTime()) {
    throw new ValidationError("Some fields need attention.", {
      [field]: [
        `${label} must be between ${earliest.toISOString().slice(0, 16)} and now (UTC), not in the future.`,
      ],
    });
  }
  return at;
}

const sameText = (a: string, b: string) => a.trim().toLowerCase() === b.trim().toLowerCase();

/**
 * A returning patient is the stored one: the MRN finds them, and a name, date
 * of birth or sex that does not match is refused (a mistyped MRN must not
 * admit one patient under another's record).
 */
export async function findOrCreatePatient(
  trx: Knex.Transaction,
  details: PatientDetails,
): Promise<{ id: number; returning: boolean }> {
  const stored = (await trx("patients").where({ mrn: details.mrn }).forUpdate().first()) as
    | {
        id: number;
        family_name: string;
        given_name: string;
        birth_date: Date | string;
        sex: string;
        version: number;
      }
    | undefined;
  if (!stored) {
    try {
      const [id] = await trx("patients").insert({
        mrn: details.mrn,
        family_name: details.familyName,
        given_name: details.givenName,
        birth_date: details.birthDate,
        sex: details.sex,
        height_cm: details.heightCm ?? null,
        weight_kg: details.weightKg ?? null,
      });
      return { id: Number(id), returning: false };
    } catch (error) {
      if (duplicateIndex(error) === "patients_mrn_unique") {
        throw new ConflictError(
          `MRN ${details.mrn} was registered by someone else a moment ago; search for it and admit the patient found.`,
          { mrn: ["Registered a moment ago by someone else."] },
        );
      }
      throw error;
    }
  }
  const birth =
    typeof stored.birth_date === "string"
      ? stored.birth_date.slice(0, 10)
      : stored.birth_date.toISOString().slice(0, 10);
  if (
    !sameText(stored.family_name, details.familyName) ||
    !sameText(stored.given_name, details.givenName) ||
    birth !== details.birthDate ||
    stored.sex !== details.sex
  ) {
    throw new ConflictError(
      `MRN ${details.mrn} belongs to ${stored.family_name}, ${stored.given_name} (born ${birth}, ${stored.sex}), not to the patient typed. Check the MRN, or use the stored details.`,
      { mrn: [`Belongs to ${stored.family_name}, ${stored.given_name}, born ${birth}.`] },
    );
  }
  // Height and weight change over a life; a returning patient's new values win.
  if (details.heightCm !== undefined || details.weightKg !== undefined) {
    await trx("patients")
      .where({ id: stored.id })
      .update({
        ...(details.heightCm !== undefined ? { height_cm: details.heightCm } : {}),
        ...(details.weightKg !== undefined ? { weight_kg: details.weightKg } : {}),
        version: stored.version + 1,
      });
  }
  return { id: stored.id, returning: true };
}

/** Both open-admission indexes in the user's words: a bed race or a double admission. */
export function rethrowOccupied(error: unknown, bedLabel: string, who: string): never {
  const index = duplicateIndex(error);
  if (index === "admissions_open_bed_id_unique") {
    throw new ConflictError(
      `Bed ${bedLabel} is no longer free: another patient was put in it a moment ago. Choose another bed.`,
      { bedId: [`Bed ${bedLabel} is taken.`] },
    );
  }
  if (index === "admissions_open_patient_id_unique") {
    throw new ConflictError(`${who} is already admitted; find them with the search and move them.`);
  }
  throw error;
}

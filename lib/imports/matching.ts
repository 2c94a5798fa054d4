import type { Knex } from "knex";
import {
  evaluateBloodGas,
  type BloodGasValues,
  type EvaluatedBloodGas,
} from "../blood-gases/service";
import { DomainError, fromEngineError } from "../errors";
import { DEVICE_PROFILES, type Device } from "../devices";
import { resolveFio2 } from "../readings/service";
import type { RowReason } from "./kinds";
import type { ImportedBloodGas, ImportedReading } from "./rows";

// The checks that need the database: which admitted patient an MRN (and bed)
// names on the import's unit, the bedside settings that give the device and
// FiO2, the admission's time window, and duplicates of rows already stored.

export type BedsideInUse = {
  device: Device;
  fio2: number;
  fio2Estimated: boolean;
  peep: number | null;
  flow: number | null;
};

export type MatchedPatient = {
  patientId: number;
  mrn: string;
  name: string;
  admissionId: number;
  admittedAt: Date;
  bedId: number;
  bedLabel: string;
  unitId: number;
  unitCode: string;
  altitudeM: number;
  timeZone: string;
  settings: BedsideInUse | null;
};

type PatientRow = {
  patient_id: number;
  mrn: string;
  given_name: string;
  family_name: string;
  admission_id: number;
  admitted_at: Date;
  bed_id: number;
  bed_label: string;
  unit_id: number;
  unit_code: string;
  altitude_m: number;
  time_zone: string;
  device: Device | null;
  fio2: number | null;
  fio2_estimated: number | null;
  peep_cmh2o: number | null;
  flow_l_min: number | null;
};

/** Admitted patients by MRN on the given units, with their bedside settings. */
export async function findAdmittedByMrn(
  knex: Knex | Knex.Transaction,
  mrns: readonly string[],
  unitIds: readonly number[],
): Promise<Map<string, MatchedPatient>> {
  const out = new Map<string, MatchedPatient>();
  const unique = [...new Set(mrns.filter((m) => m !== ""))];
  if (unique.length === 0 || unitIds.length === 0) return out;
  for (let i = 0; i < unique.length; i += 500) {
    const rows = (await knex("patients as p")
      .join("admissions as a", "a.patient_id", "p.id")
      .join("beds as b", "b.id", "a.bed_id")
      .join("units as u", "u.id", "b.unit_id")
      .leftJoin("bedside_settings as s", "s.admission_id", "a.id")
      .whereIn("p.mrn", unique.slice(i, i + 500))
      .whereIn("u.id", unitIds)
      .whereNull("a.discharged_at")
      .select(
        "p.id as patient_id",
        "p.mrn",
        "p.given_name",
        "p.family_name",
        "a.id as admission_id",
        "a.admitted_at",
        "b.id as bed_id",
        "b.label as bed_label",
        "u.id as unit_id",
        "u.code as unit_code",
        "u.altitude_m",
        "u.time_zone",
        "s.device",
        "s.fio2",
        "s.fio2_estimated",
        "s.peep_cmh2o",
        "s.flow_l_min",
      )) as PatientRow[];
    for (const r of rows) {
      out.set(r.mrn, {
        patientId: r.patient_id,
        mrn: r.mrn,
        name: `${r.family_name}, ${r.given_name}`,
        admissionId: r.admission_id,
        admittedAt: r.admitted_at,
        bedId: r.bed_id,
        bedLabel: r.bed_label,
        unitId: r.unit_id,
        unitCode: r.unit_code,
        altitudeM: r.altitude_m,
        timeZone: r.time_zone,
        settings:
          r.device === null || r.fio2 === null
            ? null
            : {
                device: r.device,
                fio2: r.fio2,
                fio2Estimated: Boolean(r.fio2_estimated),
                peep: r.peep_cmh2o,
                flow: r.flow_l_min,
              },
      });
    }
  }
  return out;
}

export const unknownPatient = (mrn: string, unitCode: string): RowReason => ({
  code: "unknown_patient",
  field: "mrn",
  message: mrn ? `MRN ${mrn} is not an admitted patient on ${unitCode}.` : "MRN is missing.",
});

export const noSettings = (): RowReason => ({
  code: "settings",
  message:
    "The patient has no bedside settings (no oxygen order applied), so the device and FiO2 in use are unknown; apply the order first.",
});

const iso = (d: Date) => d.toISOString().replace(".000Z", "Z");

/** A time inside the admission and not in the future (5 minutes of clock skew allowed). */
export function timeWindowReason(
  at: Date,
  patient: MatchedPatient,
  now: Date,
  field: string,
): RowReason | undefined {
  if (at.getTime() > now.getTime() + 5 * 60_000) {
    return { code: "time", field, message: `Time ${iso(at)} is in the future.` };
  }
  if (at.getTime() < patient.admittedAt.getTime()) {
    return {
      code: "time",
      field,
      message: `Time ${iso(at)} is before this admission began (${iso(patient.admittedAt)}).`,
    };
  }
  return undefined;
}

export type PlannedGas = {
  line: number;
  label: string;
  patient: MatchedPatient;
  values: BloodGasValues;
  evaluated: EvaluatedBloodGas;
};

/** Settings → the values the engine needs: device, flow, PEEP, and the file's FiO2 when it gives one. */
export function planGas(
  row: ImportedBloodGas,
  patient: MatchedPatient,
):
  | { ok: true; values: BloodGasValues; evaluated: EvaluatedBloodGas }
  | { ok: false; reason: RowReason } {
  const s = patient.settings;
  if (!s) return { ok: false, reason: noSettings() };
  const values: BloodGasValues = {
    patientId: patient.patientId,
    sampledAt: row.sampledAt,
    sampleType: row.sampleType,
    ph: row.ph,
    pao2: round1(row.pao2),
    paco2: round1(row.paco2),
    hco3: row.hco3 === undefined ? undefined : round1(row.hco3),
    baseExcess: row.baseExcess === undefined ? undefined : round1(row.baseExcess),
    sao2: row.sao2 === undefined ? undefined : round1(row.sao2),
    hemoglobin: row.hemoglobin === undefined ? undefined : round1(row.hemoglobin),
    device: s.device,
    flow: s.flow ?? undefined,
    fio2: row.fio2 ?? (DEVICE_PROFILES[s.device].uses.fio2 === "set" ? s.fio2 : undefined),
    peep: s.peep ?? undefined,
  };
  if (values.ph !== undefined) values.ph = Math.round(values.ph * 100) / 100;
  if (values.fio2 !== undefined) values.fio2 = Math.round(values.fio2 * 100) / 100;
  try {
    return { ok: true, values, evaluated: evaluateBloodGas(values, patient.altitudeM) };
  } catch (error) {
    const domain = fromEngineError(error) ?? error;
    if (domain instanceof DomainError) {
      const detail =
        Object.values(domain.fieldErrors ?? {})
          .flat()
          .join(" ") || domain.message;
      return { ok: false, reason: { code: "range", message: detail } };
    }
    throw error;
  }
}

const round1 = (v: number) => Math.round(v * 10) / 10;

/** The device and FiO2 a monitor reading is stored with: the bedside settings in use. */
export function readingOxygen(settings: BedsideInUse): {
  device: Device;
  flow: number | null;
  fio2: number;
  fio2Estimated: boolean;
} {
  const { fio2, estimated } = resolveFio2(
    settings.device,
    settings.flow ?? undefined,
    DEVICE_PROFILES[settings.device].uses.fio2 === "set" ? settings.fio2 : undefined,
  );
  return { device: settings.device, flow: settings.flow, fio2, fio2Estimated: estimated };
}

/** Sample times of blood gases already stored for these patients (duplicate check). */
export async function storedGasTimes(
  knex: Knex | Knex.Transaction,
  patientIds: readonly number[],
): Promise<Set<string>> {
  const set = new Set<string>();
  if (patientIds.length === 0) return set;
  const rows = (await knex("blood_gases")
    .whereIn("patient_id", [...new Set(patientIds)])
    .select("patient_id", "sampled_at")) as { patient_id: number; sampled_at: Date }[];
  for (const r of rows) set.add(`${r.patient_id}|${r.sampled_at.getTime()}`);
  return set;
}

/** Monitor reading times already stored for one patient among the given times. */
export async function storedReadingTimes(
  knex: Knex | Knex.Transaction,
  patientId: number,
  times: readonly Date[],
): Promise<Set<number>> {
  const set = new Set<number>();
  if (times.length === 0) return set;
  let min = times[0]!;
  let max = times[0]!;
  for (const t of times) {
    if (t < min) min = t;
    if (t > max) max = t;
  }
  const rows = (await knex("readings")
    .where({ patient_id: patientId, source: "monitor" })
    .whereBetween("taken_at", [min, max])
    .select("taken_at")) as { taken_at: Date }[];
  for (const r of rows) set.add(r.taken_at.getTime());
  return set;
}

export type PlannedReading = {
  line: number;
  label: string;
  patient: MatchedPatient;
  row: ImportedReading;
};

// Plans the small imports (blood gas CSV, HL7 results) whole: each row matched,
// checked and turned into what would be written. The streamed monitor CSV is in
// ./monitor-csv.

import type { Knex } from "knex";
import type { RejectedRow, RowReason } from "./kinds";
import {
  bloodGasCandidates,
  bloodGasMappingSchema,
  guessBloodGasMapping,
  readCsvTable,
  type BloodGasMapping,
} from "./csv";
import { parseOruR01, type Hl7Result } from "./hl7";
import { hl7Candidates } from "./hl7-results";
import {
  findAdmittedByMrn,
  planGas,
  storedGasTimes,
  storedReadingTimes,
  timeWindowReason,
  unknownPatient,
  type MatchedPatient,
  type PlannedGas,
  type PlannedReading,
} from "./matching";
import { SAMPLE_ROWS, type AcceptedRowView } from "./report";
import { checkBloodGasCandidate, checkReadingCandidate, type ImportedReading } from "./rows";

type Db = Knex | Knex.Transaction;

/** The unit an import is checked against: its patients must be admitted there. */
export type ImportUnit = { id: number; code: string; timeZone: string };

export async function loadUnit(knex: Db, unitId: number): Promise<ImportUnit | undefined> {
  const u = (await knex("units")
    .where({ id: unitId, active: true })
    .first("id", "code", "time_zone")) as
    { id: number; code: string; time_zone: string } | undefined;
  return u ? { id: u.id, code: u.code, timeZone: u.time_zone } : undefined;
}

/** A blood gas CSV or an HL7 message, checked row by row, ready to write. */
export type SmallPlan = {
  unit: ImportUnit;
  total: number;
  gases: PlannedGas[];
  readings: PlannedReading[];
  rejected: RejectedRow[];
  notes: string[];
  header?: string[];
  mapping?: BloodGasMapping;
  mappingErrors?: Record<string, string[]>;
  hl7?: Hl7Result;
};

const iso = (d: Date) => d.toISOString();
const n1 = (v: number | undefined, unit: string) =>
  v === undefined ? null : `${Math.round(v * 10) / 10} ${unit}`;

function gasView(g: PlannedGas): AcceptedRowView {
  const v = g.values;
  const parts = [
    n1(v.pao2, "mmHg")?.replace(/^/, "PaO2 "),
    n1(v.paco2, "mmHg")?.replace(/^/, "PaCO2 "),
    v.ph === undefined ? null : `pH ${v.ph.toFixed(2)}`,
    `FiO2 ${g.evaluated.fio2.toFixed(2)}${g.evaluated.fio2Estimated ? " (estimated)" : ""}`,
  ].filter(Boolean);
  return {
    label: g.label,
    mrn: g.patient.mrn,
    patient: `${g.patient.name}, bed ${g.patient.bedLabel}`,
    what: "blood gas",
    at: iso(v.sampledAt),
    summary: `${v.sampleType === "arterial" ? "Arterial" : "Venous"}: ${parts.join(", ")}`,
  };
}

export function readingView(r: PlannedReading): AcceptedRowView {
  return {
    label: r.label,
    mrn: r.patient.mrn,
    patient: `${r.patient.name}, bed ${r.patient.bedLabel}`,
    what: "reading",
    at: iso(r.row.takenAt),
    summary: `SpO2 ${r.row.spo2} %${r.row.pulseRate === undefined ? "" : `, pulse ${r.row.pulseRate} /min`}`,
  };
}

export function sampleOf(plan: Pick<SmallPlan, "gases" | "readings">): AcceptedRowView[] {
  return [...plan.gases.map(gasView), ...plan.readings.map(readingView)].slice(0, SAMPLE_ROWS);
}

const reject = (
  rejected: RejectedRow[],
  line: number,
  label: string,
  mrn: string,
  reason: RowReason,
) => rejected.push({ line, label, mrn: mrn || null, reasons: [reason] });

/** Checks gas rows against the database: patient, time window, duplicates, settings, engine. */
async function planGases(
  knex: Db,
  checks: ReturnType<typeof checkBloodGasCandidate>[],
  patients: Map<string, MatchedPatient>,
  unit: ImportUnit,
  now: Date,
  rejected: RejectedRow[],
): Promise<PlannedGas[]> {
  const stored = await storedGasTimes(
    knex,
    [...patients.values()].map((p) => p.patientId),
  );
  const seen = new Map<string, string>();
  const gases: PlannedGas[] = [];
  for (const check of checks) {
    if (!check.ok) {
      rejected.push(check.rejected);
      continue;
    }
    const { row, line, label } = check;
    const patient = patients.get(row.mrn);
    if (!patient) {
      reject(rejected, line, label, row.mrn, unknownPatient(row.mrn, unit.code));
      continue;
    }
    const window = timeWindowReason(row.sampledAt, patient, now, "sampledAt");
    if (window) {
      reject(rejected, line, label, row.mrn, window);
      continue;
    }
    const key = `${patient.patientId}|${row.sampledAt.getTime()}`;
    const first = seen.get(key);
    if (first) {
      reject(rejected, line, label, row.mrn, {
        code: "duplicate",
        message: `Duplicate of ${first}: same patient and time sampled.`,
      });
      continue;
    }
    seen.set(key, label);
    if (stored.has(key)) {
      reject(rejected, line, label, row.mrn, {
        code: "duplicate",
        message: `A blood gas for MRN ${row.mrn} sampled at ${iso(row.sampledAt)} is already recorded.`,
      });
      continue;
    }
    const planned = planGas(row, patient);
    if (!planned.ok) {
      reject(rejected, line, label, row.mrn, planned.reason);
      continue;
    }
    gases.push({ line, label, patient, values: planned.values, evaluated: planned.evaluated });
  }
  return gases;
}

/** Reads and checks a blood gas CSV by its mapping (guessed from the header when none is given). */
export async function planBloodGasCsv(
  knex: Db,
  content: Buffer,
  unit: ImportUnit,
  options: { delimiter: BloodGasMapping["delimiter"]; mapping?: unknown },
  now: Date,
): Promise<SmallPlan> {
  const table = readCsvTable(content.toString("utf8"), options.delimiter);
  const parsed = bloodGasMappingSchema.safeParse(
    options.mapping ?? guessBloodGasMapping(table.header, options.delimiter),
  );
  const base = {
    unit,
    total: table.rows.length,
    gases: [],
    readings: [],
    notes: [],
    header: table.header,
  };
  if (!parsed.success) {
    const mappingErrors: Record<string, string[]> = {};
    for (const issue of parsed.error.issues)
      (mappingErrors[issue.path.join(".") || "_form"] ??= []).push(issue.message);
    const fallback = guessBloodGasMapping(table.header, options.delimiter);
    return { ...base, rejected: [], mapping: fallback, mappingErrors };
  }
  const mapping = { ...parsed.data, delimiter: options.delimiter };
  const candidates = bloodGasCandidates(table, mapping);
  const checks = candidates.map((c) => checkBloodGasCandidate(c, unit.timeZone));
  const patients = await findAdmittedByMrn(
    knex,
    checks.flatMap((c) => (c.ok ? [c.row.mrn] : [])),
    [unit.id],
  );
  const rejected: RejectedRow[] = [];
  const gases = await planGases(knex, checks, patients, unit, now, rejected);
  rejected.sort((a, b) => a.line - b.line);
  return { ...base, gases, rejected, mapping };
}

/**
 * Reads and checks an ORU^R01 message. The patient is matched on the given
 * units; the import belongs to the unit where the patient is admitted.
 */
export async function planHl7(
  knex: Db,
  content: Buffer,
  unitIds: readonly number[],
  fallbackUnit: ImportUnit,
  now: Date,
): Promise<SmallPlan> {
  const message = parseOruR01(content.toString("utf8"));
  const patients = await findAdmittedByMrn(knex, [message.mrn], unitIds);
  const patient = patients.get(message.mrn);
  const unit = patient
    ? { id: patient.unitId, code: patient.unitCode, timeZone: patient.timeZone }
    : fallbackUnit;
  const { bloodGases, readings: readingCandidates, ignored } = hl7Candidates(message);
  const rejected: RejectedRow[] = [];
  const gases = await planGases(
    knex,
    bloodGases.map((c) => checkBloodGasCandidate(c, unit.timeZone)),
    patients,
    unit,
    now,
    rejected,
  );
  const readings: PlannedReading[] = [];
  const seen = new Set<number>();
  const okReadings = readingCandidates.map((c) => checkReadingCandidate(c, unit.timeZone));
  const stored = patient
    ? await storedReadingTimes(
        knex,
        patient.patientId,
        okReadings.flatMap((c) => (c.ok ? [c.row.takenAt] : [])),
      )
    : new Set<number>();
  for (const check of okReadings) {
    if (!check.ok) {
      rejected.push(check.rejected);
      continue;
    }
    const { row, line, label } = check;
    const reason = readingReason(row, patient, unit, now, seen, stored);
    if (reason) reject(rejected, line, label, row.mrn, reason);
    else readings.push({ line, label, patient: patient!, row });
  }
  rejected.sort((a, b) => a.line - b.line);
  return {
    unit,
    total: bloodGases.length + readingCandidates.length,
    gases,
    readings,
    rejected,
    notes: ignored,
    hl7: message,
  };
}

/** Why a charted or imported reading cannot be taken (patient, time window, duplicate), or null. */
export function readingReason(
  row: ImportedReading,
  patient: MatchedPatient | undefined,
  unit: ImportUnit,
  now: Date,
  seen: Set<number>,
  stored: Set<number>,
): RowReason | undefined {
  if (!patient) return unknownPatient(row.mrn, unit.code);
  const window = timeWindowReason(row.takenAt, patient, now, "takenAt");
  if (window) return window;
  const t = row.takenAt.getTime();
  if (seen.has(t)) {
    return {
      code: "duplicate",
      field: "takenAt",
      message: `Duplicate time ${iso(row.takenAt)}: an earlier row has the same time.`,
    };
  }
  seen.add(t);
  if (stored.has(t)) {
    return {
      code: "duplicate",
      field: "takenAt",
      message: `A monitor reading at ${iso(row.takenAt)} is already stored for this patient.`,
    };
  }
  if (!patient.settings) {
    return {
      code: "settings",
      message:
        "The patient has no bedside settings (no oxygen order applied), so the device and FiO2 in use are unknown.",
    };
  }
  return undefined;
}

/** The row columns of readings written by an import. */

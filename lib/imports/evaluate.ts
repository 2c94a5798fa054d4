import { Readable } from "node:stream";
import { CsvError, parse } from "csv-parse";
import type { Knex } from "knex";
import { afterReadingsCharted, type ChartedReading } from "../alerts/service";
import type { LedgerActor } from "../ledger/service";
import type { RejectedRow, RowReason } from "./kinds";
import {
  bloodGasCandidates,
  bloodGasMappingSchema,
  guessBloodGasMapping,
  ImportFileError,
  monitorCandidate,
  readCsvTable,
  readMonitorHeader,
  type BloodGasMapping,
  type MonitorHeader,
} from "./csv";
import { parseOruR01, type Hl7Result } from "./hl7";
import { hl7Candidates } from "./hl7-results";
import {
  findAdmittedByMrn,
  planGas,
  readingOxygen,
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

function readingView(r: PlannedReading): AcceptedRowView {
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

function readingReason(
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
export function readingInsertRow(
  r: { patient: MatchedPatient; row: ImportedReading },
  importId: number,
  recordedBy: number | null,
) {
  const oxygen = readingOxygen(r.patient.settings!);
  return {
    patient_id: r.patient.patientId,
    admission_id: r.patient.admissionId,
    taken_at: r.row.takenAt,
    spo2_pct: r.row.spo2,
    respiratory_rate_per_min: null,
    pulse_rate_per_min: r.row.pulseRate ?? null,
    device: oxygen.device,
    flow_l_min: oxygen.flow,
    fio2: oxygen.fio2,
    fio2_estimated: oxygen.fio2Estimated,
    source: "monitor" as const,
    recorded_by: recordedBy,
    import_id: importId,
  };
}

export function chartedReadings(rows: ReturnType<typeof readingInsertRow>[]): ChartedReading[] {
  return rows.map((r) => ({
    takenAt: r.taken_at,
    spo2: r.spo2_pct,
    fio2: r.fio2,
    flow: r.flow_l_min,
    source: "monitor",
  }));
}

export const alertAdmissionOf = (p: MatchedPatient) => ({
  admissionId: p.admissionId,
  patientId: p.patientId,
  unitId: p.unitId,
  bedId: p.bedId,
});

/**
 * A stored file as a stream of 64 KiB chunks. One big chunk would let the CSV
 * parser turn the whole file into records before the first batch is written;
 * small chunks keep backpressure, so only a batch or so of rows is ever held.
 */
export function fileStream(content: Buffer, chunkBytes = 64 * 1024): Readable {
  return Readable.from(
    (function* () {
      for (let at = 0; at < content.length; at += chunkBytes)
        yield content.subarray(at, at + chunkBytes);
    })(),
    { objectMode: false },
  );
}

/** Rows per multi-row INSERT of a monitor file. */
export const MONITOR_BATCH = 1000;

export type MonitorWriter = {
  trx: Knex.Transaction;
  importId: number;
  recordedBy: number | null;
  ledgerActor: LedgerActor;
};

export type MonitorOutcome = {
  patient: MatchedPatient;
  total: number;
  accepted: number;
  rejected: RejectedRow[];
  sample: AcceptedRowView[];
  firstAt: Date | null;
  lastAt: Date | null;
};

/**
 * Streams a monitor CSV through csv-parse, checking each row and, when a
 * writer is given, inserting the good ones in batches of MONITOR_BATCH with
 * alert detection after each batch. Holds one batch of rows at a time (plus
 * the set of seen times, for the in-file duplicate check), never the file's
 * rows.
 */
export async function streamMonitorCsv(
  knex: Db,
  source: Readable,
  unit: ImportUnit,
  who: { mrn: string; bed: string },
  now: Date,
  writer: MonitorWriter | null,
): Promise<MonitorOutcome> {
  const patients = await findAdmittedByMrn(knex, [who.mrn], [unit.id]);
  const patient = patients.get(who.mrn);
  if (!patient)
    throw new ImportFileError(
      `MRN ${who.mrn} is not an admitted patient on ${unit.code}; no row of the file was imported.`,
    );
  if (patient.bedLabel !== who.bed) {
    throw new ImportFileError(
      `MRN ${who.mrn} is admitted on ${unit.code} bed ${patient.bedLabel}, not bed ${who.bed}; check which monitor the file came from.`,
    );
  }
  if (!patient.settings) {
    throw new ImportFileError(
      `MRN ${who.mrn} has no bedside settings (no oxygen order applied), so the device and FiO2 of the readings are unknown; apply the order first.`,
    );
  }
  const outcome: MonitorOutcome = {
    patient,
    total: 0,
    accepted: 0,
    rejected: [],
    sample: [],
    firstAt: null,
    lastAt: null,
  };
  const seen = new Set<number>();
  let batch: { line: number; label: string; row: ImportedReading }[] = [];

  const flush = async () => {
    if (batch.length === 0) return;
    const stored = await storedReadingTimes(
      writer?.trx ?? knex,
      patient.patientId,
      batch.map((b) => b.row.takenAt),
    );
    const good = batch.filter((b) => {
      if (!stored.has(b.row.takenAt.getTime())) return true;
      outcome.rejected.push({
        line: b.line,
        label: b.label,
        mrn: who.mrn,
        reasons: [
          {
            code: "duplicate",
            field: "takenAt",
            message: `A monitor reading at ${iso(b.row.takenAt)} is already stored for this patient.`,
          },
        ],
      });
      return false;
    });
    for (const b of good) {
      if (!outcome.firstAt || b.row.takenAt < outcome.firstAt) outcome.firstAt = b.row.takenAt;
      if (!outcome.lastAt || b.row.takenAt > outcome.lastAt) outcome.lastAt = b.row.takenAt;
      if (outcome.sample.length < SAMPLE_ROWS) outcome.sample.push(readingView({ ...b, patient }));
    }
    outcome.accepted += good.length;
    if (writer && good.length > 0) {
      const rows = good.map((b) =>
        readingInsertRow({ patient, row: b.row }, writer.importId, writer.recordedBy),
      );
      await writer.trx("readings").insert(rows);
      await afterReadingsCharted(
        writer.trx,
        writer.ledgerActor,
        alertAdmissionOf(patient),
        chartedReadings(rows),
        now,
      );
    }
    batch = [];
  };

  const parser = source.pipe(
    parse({ bom: true, info: true, relax_column_count: true, skip_empty_lines: true, trim: true }),
  );
  let header: MonitorHeader | null = null;
  let width = 0;
  try {
    for await (const record of parser as AsyncIterable<{
      record: string[];
      info: { lines: number };
    }>) {
      if (!header) {
        header = readMonitorHeader(record.record);
        width = record.record.length;
        continue;
      }
      outcome.total += 1;
      const line = record.info.lines;
      const check = checkReadingCandidate(
        monitorCandidate(record.record, line, header, width, who.mrn),
        unit.timeZone,
      );
      if (!check.ok) {
        outcome.rejected.push(check.rejected);
        continue;
      }
      const reason = readingReason(check.row, patient, unit, now, seen, new Set());
      if (reason) {
        outcome.rejected.push({ line, label: check.label, mrn: who.mrn, reasons: [reason] });
        continue;
      }
      batch.push({ line, label: check.label, row: check.row });
      if (batch.length >= MONITOR_BATCH) await flush();
    }
  } catch (error) {
    if (error instanceof CsvError)
      throw new ImportFileError(`The file is not valid CSV: ${error.message}`);
    throw error;
  }
  await flush();
  if (!header) throw new ImportFileError("The file is empty.");
  outcome.rejected.sort((a, b) => a.line - b.line);
  return outcome;
}

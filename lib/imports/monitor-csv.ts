// The monitor SpO2 CSV, streamed: rows are checked and written in batches of
// MONITOR_BATCH, each batch with its alert detection, so a day of 1 Hz readings
// never sits in memory whole; the rollups follow once, after the last batch.
// The smaller files are planned in ./evaluate.

import { Readable } from "node:stream";
import { refreshAfterReadings } from "../rollups/store";
import { CsvError, Parser } from "csv-parse";
import type { Knex } from "knex";
import { afterReadingsCharted, type ChartedReading } from "../alerts/service";
import type { LedgerActor } from "../ledger/service";
import type { RejectedRow } from "./kinds";
import { ImportFileError, monitorCandidate, readMonitorHeader, type MonitorHeader } from "./csv";
import {
  findAdmittedByMrn,
  readingOxygen,
  storedReadingTimes,
  type MatchedPatient,
} from "./matching";
import { SAMPLE_ROWS, type AcceptedRowView } from "./report";
import { checkReadingCandidate, type ImportedReading } from "./rows";
import { readingReason, readingView, type ImportUnit } from "./evaluate";

type Db = Knex | Knex.Transaction;
const iso = (d: Date) => d.toISOString();

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

const MONITOR_COLUMNS = `patient_id, admission_id, taken_at, spo2_pct, respiratory_rate_per_min,
  pulse_rate_per_min, device, flow_l_min, fio2, fio2_estimated, source, recorded_by, import_id`;

/**
 * The multi-row INSERT of a batch of monitor readings, as readingInsertRow
 * would store them, written out directly: through the query builder each
 * value became a bound parameter (13 per row) that was escaped again per row
 * although only the time, SpO2 and pulse vary. The columns that do not vary
 * are escaped once per file; the varying ones are checked numbers and a Date,
 * written as the driver writes them (UTC, the connection's time zone).
 */
function monitorInsert(
  knex: Db,
  patient: MatchedPatient,
  importId: number,
  recordedBy: number | null,
): (rows: readonly ImportedReading[]) => string {
  const oxygen = readingOxygen(patient.settings!);
  const fixed = knex
    .raw("?, ?, ?, ?, 'monitor', ?, ?", [
      oxygen.device,
      oxygen.flow,
      oxygen.fio2,
      oxygen.fio2Estimated,
      recordedBy,
      importId,
    ])
    .toQuery();
  const lead = `(${Number(patient.patientId)}, ${Number(patient.admissionId)}, '`;
  return (rows) => {
    let sql = `INSERT INTO readings (${MONITOR_COLUMNS}) VALUES `;
    for (let i = 0; i < rows.length; i++) {
      const r = rows[i]!;
      const at = r.takenAt.toISOString();
      sql += `${i ? ", " : ""}${lead}${at.slice(0, 10)} ${at.slice(11, 23)}', ${Number(r.spo2)}, NULL, ${r.pulseRate === undefined ? "NULL" : Number(r.pulseRate)}, ${fixed})`;
    }
    return sql;
  };
}

/**
 * csv-parse handing on each record with the line it ended on. Its `info`
 * option does that by copying all its counters twice per record (more than
 * half the parse time of a monitor file, and much of its garbage); the one
 * counter needed is read here as the record is pushed, the moment that copy
 * is taken.
 */
class NumberedRecords extends Parser {
  override push(record: unknown, encoding?: BufferEncoding): boolean {
    return super.push(
      record === null ? null : { record: record as string[], lines: this.info.lines },
      encoding,
    );
  }
}

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
 * alert detection after each batch, then refreshing the rollups over their
 * span. Holds one batch of rows at a time (plus the set of seen times, for the
 * in-file duplicate check), never the file's rows.
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
  const oxygen = readingOxygen(patient.settings);
  const insertSql =
    writer && monitorInsert(writer.trx, patient, writer.importId, writer.recordedBy);
  const seen = new Set<number>();
  const noneStored = new Set<number>();
  type Batch = { line: number; label: string; row: ImportedReading }[];
  let batch: Batch = [];

  const flush = async (rows: Batch) => {
    if (rows.length === 0) return;
    const stored = await storedReadingTimes(
      writer?.trx ?? knex,
      patient.patientId,
      rows.map((b) => b.row.takenAt),
    );
    const good = rows.filter((b) => {
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
    if (writer && insertSql && good.length > 0) {
      const readings = good.map((b) => b.row);
      await writer.trx.raw(insertSql(readings));
      await afterReadingsCharted(
        writer.trx,
        writer.ledgerActor,
        alertAdmissionOf(patient),
        readings.map((r) => ({
          takenAt: r.takenAt,
          spo2: r.spo2,
          fio2: oxygen.fio2,
          flow: oxygen.flow,
          source: "monitor",
        })),
        now,
      );
    }
  };

  // A full batch is written while the next one is parsed and checked, so the
  // database and this process work at the same time. Batches still reach the
  // database one at a time, in file order: each waits for the one before it.
  let writing: Promise<void> = Promise.resolve();
  const send = async () => {
    const full = batch;
    batch = [];
    await writing;
    writing = flush(full);
    // Handled here so it is never unhandled; the next `await writing` rethrows it.
    writing.catch(() => undefined);
  };

  const parser = source.pipe(
    new NumberedRecords({
      bom: true,
      relax_column_count: true,
      skip_empty_lines: true,
      trim: true,
    }),
  );
  let header: MonitorHeader | null = null;
  let width = 0;
  try {
    for await (const record of parser as AsyncIterable<{ record: string[]; lines: number }>) {
      if (!header) {
        header = readMonitorHeader(record.record);
        width = record.record.length;
        continue;
      }
      outcome.total += 1;
      const line = record.lines;
      const check = checkReadingCandidate(
        monitorCandidate(record.record, line, header, width, who.mrn),
        unit.timeZone,
      );
      if (!check.ok) {
        outcome.rejected.push(check.rejected);
        continue;
      }
      const reason = readingReason(check.row, patient, unit, now, seen, noneStored);
      if (reason) {
        outcome.rejected.push({ line, label: check.label, mrn: who.mrn, reasons: [reason] });
        continue;
      }
      batch.push({ line, label: check.label, row: check.row });
      if (batch.length >= MONITOR_BATCH) await send();
    }
    await send();
    await writing;
  } catch (error) {
    // Nothing of this import may still be talking to the database once it has failed.
    await writing.catch(() => undefined);
    if (error instanceof CsvError)
      throw new ImportFileError(`The file is not valid CSV: ${error.message}`);
    throw error;
  }
  if (!header) throw new ImportFileError("The file is empty.");
  // The rollups once for the whole file, after its last batch: one recomputation
  // over the span the rows can change, instead of one per batch that each
  // re-read the batch before it.
  if (writer && outcome.firstAt && outcome.lastAt)
    await refreshAfterReadings(
      writer.trx,
      { admissionId: patient.admissionId, patientId: patient.patientId },
      outcome.firstAt,
      outcome.lastAt,
      "monitor",
    );
  outcome.rejected.sort((a, b) => a.line - b.line);
  return outcome;
}

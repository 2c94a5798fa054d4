import type { Knex } from "knex";
import { MINUTE_MS, SLOT_MS, type RollupMeasures } from "./buckets";

/** One stored bucket: a half-hour row or a minute row, with where the patient lay. */
export type RollupPiece = {
  admissionId: number;
  patientId: number;
  bedId: number;
  unitId: number;
  /** Start (ms since the epoch) and length (60 000 or 1 800 000 ms). */
  at: number;
  ms: number;
  m: RollupMeasures;
};

type Row = MeasureColumns & {
  admission_id: number;
  patient_id: number;
  bed_id: number;
  unit_id: number;
  at: number | string;
};

/** The measure columns of a rollup row (or of their SQL sums), as mysql2 returns them. */
export type MeasureColumns = {
  below_ms: number | string;
  in_band_ms: number | string;
  above_ms: number | string;
  below88_ms: number | string;
  below85_ms: number | string;
  below_area_pct_s: number | string;
  min_spo2_pct: number | string | null;
  o2_ms: number | string;
  fio2_excess_s: number | string;
  fio2_high_ms: number | string;
};

export function measuresOfRow(r: MeasureColumns): RollupMeasures {
  return {
    belowMs: Number(r.below_ms),
    inBandMs: Number(r.in_band_ms),
    aboveMs: Number(r.above_ms),
    below88Ms: Number(r.below88_ms),
    below85Ms: Number(r.below85_ms),
    belowAreaPctS: Number(r.below_area_pct_s),
    minSpo2: r.min_spo2_pct === null ? null : Number(r.min_spo2_pct),
    o2Ms: Number(r.o2_ms),
    fio2ExcessS: Number(r.fio2_excess_s),
    fio2HighMs: Number(r.fio2_high_ms),
  };
}

const COLUMNS = `admission_id, patient_id, bed_id, unit_id, below_ms, in_band_ms, above_ms, below88_ms, below85_ms,
  below_area_pct_s, min_spo2_pct, o2_ms, fio2_excess_s, fio2_high_ms`;

const toPiece =
  (ms: number) =>
  (r: Row): RollupPiece => ({
    admissionId: r.admission_id,
    patientId: r.patient_id,
    bedId: r.bed_id,
    unitId: r.unit_id,
    at: Number(r.at),
    ms,
    m: measuresOfRow(r),
  });

/**
 * [start, end) (whole minutes) split into the runs of whole half hours with no
 * cut strictly inside them (read from rollup_slots) and the rest (read from
 * rollup_minutes).
 */
export function rollupRanges(
  start: number,
  end: number,
  cuts: readonly number[],
): { slots: [number, number][]; minutes: [number, number][] } {
  const inside = cuts.filter((c) => c > start && c < end && c % SLOT_MS !== 0);
  const cutSlots = new Set(inside.map((c) => c - (c % SLOT_MS)));
  const first = Math.ceil(start / SLOT_MS) * SLOT_MS;
  const last = Math.floor(end / SLOT_MS) * SLOT_MS;
  const minutes: [number, number][] = [];
  const slots: [number, number][] = [];
  if (first >= last) return { slots, minutes: [[start, end]] };
  if (start < first) minutes.push([start, first]);
  let runStart = first;
  for (let h = first; h < last; h += SLOT_MS) {
    if (!cutSlots.has(h)) continue;
    if (h > runStart) slots.push([runStart, h]);
    minutes.push([h, h + SLOT_MS]);
    runStart = h + SLOT_MS;
  }
  if (last > runStart) slots.push([runStart, last]);
  if (last < end) minutes.push([last, end]);
  return { slots, minutes };
}

/**
 * The stored rollups of [from, to) (whole minutes; a partial minute is
 * dropped) for some admissions or some units: half-hour rows for the whole
 * half hours no cut falls inside, minute rows for the rest — so no piece straddles
 * `from`, `to` or any cut (a shift or day boundary), and grouping pieces by
 * their start is exact to the minute.
 */
export async function loadRollupPieces(
  knex: Knex | Knex.Transaction,
  where: {
    admissionIds?: readonly number[];
    unitIds?: readonly number[];
    from: Date;
    to: Date;
    cuts?: readonly number[];
  },
): Promise<RollupPiece[]> {
  const start = Math.ceil(where.from.getTime() / MINUTE_MS) * MINUTE_MS;
  const end = Math.floor(where.to.getTime() / MINUTE_MS) * MINUTE_MS;
  const ids = where.admissionIds ?? where.unitIds;
  if (end <= start || !ids || ids.length === 0) return [];
  const key = where.admissionIds ? "admission_id" : "unit_id";
  const list = ids.map(() => "?").join(",");

  const { slots: slotRanges, minutes: minuteRanges } = rollupRanges(start, end, where.cuts ?? []);
  const epoch = (col: string) => `TIMESTAMPDIFF(SECOND, '1970-01-01', ${col}) * 1000 AS at`;
  const query = (table: string, col: string, ranges: [number, number][]) =>
    ranges.length === 0
      ? Promise.resolve([] as Row[])
      : knex
          .raw(
            `SELECT ${COLUMNS}, ${epoch(col)} FROM ${table}
              WHERE ${key} IN (${list}) AND (${ranges.map(() => `(${col} >= ? AND ${col} < ?)`).join(" OR ")})`,
            [...ids, ...ranges.flatMap(([a, b]) => [new Date(a), new Date(b)])],
          )
          .then(([rows]: [Row[]]) => rows);
  const [slots, minutes] = await Promise.all([
    query("rollup_slots", "slot_at", slotRanges),
    query("rollup_minutes", "minute_at", minuteRanges),
  ]);
  return [...slots.map(toPiece(SLOT_MS)), ...minutes.map(toPiece(MINUTE_MS))];
}

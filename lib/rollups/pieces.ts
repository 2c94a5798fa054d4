import type { Knex } from "knex";
import { HOUR_MS, MINUTE_MS, type RollupMeasures } from "./buckets";

/** One stored bucket: an hour row or a minute row, with where the patient lay. */
export type RollupPiece = {
  admissionId: number;
  patientId: number;
  bedId: number;
  unitId: number;
  /** Start (ms since the epoch) and length (60 000 or 3 600 000 ms). */
  at: number;
  ms: number;
  m: RollupMeasures;
};

type Row = {
  admission_id: number;
  patient_id: number;
  bed_id: number;
  unit_id: number;
  at: number | string;
  below_ms: number;
  in_band_ms: number;
  above_ms: number;
  below88_ms: number;
  below85_ms: number;
  below_area_pct_s: number;
  min_spo2_pct: number | null;
  o2_ms: number;
  fio2_excess_s: number;
  fio2_high_ms: number;
};

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
    m: {
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
    },
  });

/**
 * The stored rollups of [from, to) (whole minutes; a partial minute is
 * dropped) for some admissions or some units: hour rows for the whole hours
 * no cut falls inside, minute rows for the rest — so no piece straddles
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

  // Whole hours inside [start, end) with no cut strictly inside them.
  const cuts = (where.cuts ?? []).filter((c) => c > start && c < end && c % HOUR_MS !== 0);
  const cutHours = new Set(cuts.map((c) => c - (c % HOUR_MS)));
  const firstHour = Math.ceil(start / HOUR_MS) * HOUR_MS;
  const lastHour = Math.floor(end / HOUR_MS) * HOUR_MS;
  const minuteRanges: [number, number][] = [];
  const hourRanges: [number, number][] = [];
  if (firstHour >= lastHour) minuteRanges.push([start, end]);
  else {
    if (start < firstHour) minuteRanges.push([start, firstHour]);
    let runStart = firstHour;
    for (let h = firstHour; h < lastHour; h += HOUR_MS) {
      if (!cutHours.has(h)) continue;
      if (h > runStart) hourRanges.push([runStart, h]);
      minuteRanges.push([h, h + HOUR_MS]);
      runStart = h + HOUR_MS;
    }
    if (lastHour > runStart) hourRanges.push([runStart, lastHour]);
    if (lastHour < end) minuteRanges.push([lastHour, end]);
  }
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
  const [hours, minutes] = await Promise.all([
    query("rollup_hours", "hour_at", hourRanges),
    query("rollup_minutes", "minute_at", minuteRanges),
  ]);
  return [...hours.map(toPiece(HOUR_MS)), ...minutes.map(toPiece(MINUTE_MS))];
}

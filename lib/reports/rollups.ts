import type { Knex } from "knex";
import { MINUTE_MS, type RollupMeasures } from "../rollups/buckets";
import { measuresOfRow, rollupRanges, type MeasureColumns } from "../rollups/pieces";
import type { TimeSlot } from "./groups";

/**
 * The unit's rollups over [from, to), summed in the database per admission,
 * bed and row (a shift or day; the whole period for patient and bed rows).
 * The same ranges as lib/rollups/pieces.ts — half-hour rows where no row
 * boundary falls inside the half hour, minute rows elsewhere — but summed
 * where they are, so 30 days of a 60-bed unit return a few thousand sums
 * instead of tens of thousands of buckets.
 */
export type RollupSum = {
  admissionId: number;
  patientId: number;
  bedId: number;
  /** Start of the row's time (its slot, or the period), ms. */
  at: number;
  m: RollupMeasures;
};

type Row = MeasureColumns & {
  admission_id: number;
  patient_id: number;
  bed_id: number;
  slot: number | string;
};

const SUMS = `SUM(below_ms) AS below_ms, SUM(in_band_ms) AS in_band_ms, SUM(above_ms) AS above_ms,
  SUM(below88_ms) AS below88_ms, SUM(below85_ms) AS below85_ms, SUM(below_area_pct_s) AS below_area_pct_s,
  MIN(min_spo2_pct) AS min_spo2_pct, SUM(o2_ms) AS o2_ms, SUM(fio2_excess_s) AS fio2_excess_s,
  SUM(fio2_high_ms) AS fio2_high_ms`;

export async function loadRollupSums(
  knex: Knex,
  where: {
    unitId: number;
    /** The admissions that lay on the unit in the period (the stays'). */
    admissionIds: readonly number[];
    from: Date;
    to: Date;
    slots: readonly TimeSlot[];
  },
): Promise<RollupSum[]> {
  const start = Math.ceil(where.from.getTime() / MINUTE_MS) * MINUTE_MS;
  const end = Math.floor(where.to.getTime() / MINUTE_MS) * MINUTE_MS;
  if (end <= start || where.admissionIds.length === 0) return [];
  const bounds = where.slots.slice(1).map((s) => s.from);
  const { slots: halfHours, minutes } = rollupRanges(start, end, bounds);
  const query = (table: string, col: string, ranges: [number, number][]) => {
    if (ranges.length === 0) return Promise.resolve([] as Row[]);
    // The row a bucket belongs to: the index of its slot (0 without slots).
    const slot =
      bounds.length === 0
        ? "0"
        : `CASE ${bounds.map((_, i) => `WHEN ${col} < ? THEN ${i}`).join(" ")} ELSE ${bounds.length} END`;
    return knex
      .raw(
        // By admission first: the primary key (admission_id, time) keeps each
        // range one contiguous read, where the unit index would look up every row.
        `SELECT admission_id, patient_id, bed_id, ${slot} AS slot, ${SUMS} FROM ${table} FORCE INDEX (PRIMARY)
          WHERE admission_id IN (${where.admissionIds.map(() => "?").join(",")}) AND unit_id = ? AND (${ranges.map(() => `(${col} >= ? AND ${col} < ?)`).join(" OR ")})
          GROUP BY admission_id, patient_id, bed_id, slot`,
        [
          ...bounds.map((b) => new Date(b)),
          ...where.admissionIds,
          where.unitId,
          ...ranges.flatMap(([a, b]) => [new Date(a), new Date(b)]),
        ],
      )
      .then(([rows]: [Row[]]) => rows);
  };
  const [h, m] = await Promise.all([
    query("rollup_slots", "slot_at", halfHours),
    query("rollup_minutes", "minute_at", minutes),
  ]);
  return [...h, ...m].map((r) => ({
    admissionId: r.admission_id,
    patientId: r.patient_id,
    bedId: r.bed_id,
    at: where.slots.length ? where.slots[Number(r.slot)]!.from : start,
    m: measuresOfRow(r),
  }));
}

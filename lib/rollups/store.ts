import type { Knex } from "knex";
import { MAX_CARRY_FORWARD_MS, MONITOR_MAX_CARRY_MS, type SeriesReading } from "../time-in-band";
import {
  fio2Timeline,
  HOUR_MS,
  MINUTE_MS,
  minuteMeasures,
  SLOT_MS,
  type RollupMeasures,
} from "./buckets";
import { loadBands } from "./bands";
import { loadStays, type Stay } from "./stays";
import { transact } from "../transaction";

/**
 * Keeps rollup_minutes and rollup_slots equal to a recomputation from the raw
 * rows. Every write that changes what the SpO2 series or the applied FiO2 of
 * an admission did over some stretch calls {@link refreshRollups} for that
 * stretch inside its own transaction; `npm run rollups:rebuild` does the same
 * for any period.
 */

const floorTo = (ms: number, step: number) => ms - (((ms % step) + step) % step);
const ceilTo = (ms: number, step: number) => floorTo(ms + step - 1, step);

/** Monitor samples read before the refreshed stretch, so the first ones inside it know their interval. */
const LEAD_MS = 2 * MONITOR_MAX_CARRY_MS;

/**
 * The readings index a time range of one patient needs. Named because the
 * optimizer otherwise takes `patient_id = ?` alone (a "ref" over every reading
 * of the patient) for MAX/MIN and ORDER BY … LIMIT 1 with the admission as an
 * extra filter: each import batch then read the whole stored series again.
 */
const BY_PATIENT_TIME = "FORCE INDEX (readings_patient_id_taken_at_index)";
/** (admission_id, source, taken_at): the next monitor sample after a time is one index entry. */
const BY_ADMISSION_SOURCE_TIME = "FORCE INDEX (readings_manual_index)";

type ReadingRow = {
  t: number | string;
  spo2_pct: number;
  fio2: number;
  flow_l_min: number | null;
  source: "manual" | "monitor";
};

async function loadSeries(
  knex: Knex,
  { admissionId, patientId }: { admissionId: number; patientId: number },
  from: number,
  to: number,
): Promise<SeriesReading[]> {
  const cols = `TIMESTAMPDIFF(MICROSECOND, '1970-01-01', taken_at) DIV 1000 AS t, spo2_pct, fio2, flow_l_min, source`;
  const lead = new Date(from - LEAD_MS);
  // The reading before the lead window too: a charted value may still hold.
  const [[rows], [carry]] = (await Promise.all([
    knex.raw(
      `SELECT ${cols} FROM readings ${BY_PATIENT_TIME} WHERE patient_id = ? AND admission_id = ? AND taken_at >= ? AND taken_at < ? ORDER BY taken_at, id`,
      [patientId, admissionId, lead, new Date(to)],
    ),
    knex.raw(
      `SELECT ${cols} FROM readings ${BY_PATIENT_TIME} WHERE patient_id = ? AND admission_id = ? AND taken_at < ? ORDER BY taken_at DESC, id DESC LIMIT 1`,
      [patientId, admissionId, lead],
    ),
  ])) as [[ReadingRow[]], [ReadingRow[]]];
  return [...carry, ...rows].map((r) => ({
    t: Number(r.t),
    spo2: Number(r.spo2_pct),
    fio2: Number(r.fio2),
    flow: r.flow_l_min === null ? null : Number(r.flow_l_min),
    source: r.source,
  }));
}

/** A rollup_minutes row (the bench builds its rows with it too). */
export function minuteRow(
  where: { admissionId: number; patientId: number; bedId: number; unitId: number },
  minute: number,
  m: RollupMeasures,
) {
  return {
    admission_id: where.admissionId,
    minute_at: new Date(minute),
    bed_id: where.bedId,
    unit_id: where.unitId,
    patient_id: where.patientId,
    below_ms: Math.round(m.belowMs),
    in_band_ms: Math.round(m.inBandMs),
    above_ms: Math.round(m.aboveMs),
    below88_ms: Math.round(m.below88Ms),
    below85_ms: Math.round(m.below85Ms),
    below_area_pct_s: m.belowAreaPctS,
    min_spo2_pct: m.minSpo2,
    o2_ms: Math.round(m.o2Ms),
    fio2_excess_s: m.fio2ExcessS,
    fio2_high_ms: Math.round(m.fio2HighMs),
  };
}

/** Half-hour rows summed from minute rows: add a WHERE between the two parts. */
export const SLOTS_FROM_MINUTES = `INSERT INTO rollup_slots (admission_id, slot_at, bed_id, patient_id, unit_id,
    below_ms, in_band_ms, above_ms, below88_ms, below85_ms, below_area_pct_s, min_spo2_pct, o2_ms,
    fio2_excess_s, fio2_high_ms)
  SELECT admission_id, minute_at - INTERVAL MINUTE(minute_at) % 30 MINUTE, bed_id, MIN(patient_id), MIN(unit_id),
    SUM(below_ms), SUM(in_band_ms), SUM(above_ms), SUM(below88_ms), SUM(below85_ms), SUM(below_area_pct_s),
    MIN(min_spo2_pct), SUM(o2_ms), SUM(fio2_excess_s), SUM(fio2_high_ms)
  FROM rollup_minutes`;
export const SLOTS_GROUP =
  "GROUP BY admission_id, minute_at - INTERVAL MINUTE(minute_at) % 30 MINUTE, bed_id";

const stayAt = (stays: readonly Stay[], t: number) =>
  stays.find((s) => s.from <= t && t < s.to) ??
  // A stay that starts inside the minute still owns it.
  stays.find((s) => s.from < t + MINUTE_MS && t < s.to);

/**
 * The longest stretch whose readings are loaded at once: a day of 1 Hz monitor
 * samples is recomputed a quarter at a time, so memory stays flat (about
 * 22,000 samples) whatever the stretch. Windows end on half hours.
 */
const WINDOW_MS = 6 * HOUR_MS;

/** Recomputes the admission's rollups over [from, to), widened to whole minutes and hours. */
export async function refreshRollups(
  trx: Knex | Knex.Transaction,
  admissionId: number,
  from: Date,
  to: Date,
): Promise<void> {
  const start = floorTo(from.getTime(), MINUTE_MS);
  const end = ceilTo(to.getTime(), MINUTE_MS);
  if (end <= start) return;
  // Readings are found through (patient_id, taken_at), the index they have.
  const { patient_id: patientId } = (await trx("admissions")
    .where({ id: admissionId })
    .first("patient_id")) as { patient_id: number };
  const [stays, { bands, orders }, changes] = await Promise.all([
    loadStays(trx, { admissionIds: [admissionId] }),
    loadBands(trx, admissionId),
    trx("adjustments")
      .where({ admission_id: admissionId })
      .where("applied_at", "<", new Date(end))
      .select("applied_at", "to_fio2") as Promise<{ applied_at: Date; to_fio2: number }[]>,
  ]);
  const fio2 = fio2Timeline(
    orders,
    changes.map((c) => ({ at: c.applied_at.getTime(), fio2: Number(c.to_fio2) })),
  );
  // Each window loads its own lead and carry, as any refresh does, so its
  // minutes come out as they would from one pass over the whole stretch.
  for (let winFrom = start; winFrom < end;) {
    const winTo = Math.min(end, floorTo(winFrom, SLOT_MS) + WINDOW_MS);
    const series = await loadSeries(trx, { admissionId, patientId }, winFrom, winTo);
    const rows = [];
    for (const [minute, m] of minuteMeasures({ series, bands, fio2, from: winFrom, to: winTo })) {
      const stay = stayAt(stays, minute);
      if (!stay) continue; // before admission or after discharge
      rows.push(minuteRow({ ...stay, admissionId }, minute, m));
    }
    await trx("rollup_minutes")
      .where({ admission_id: admissionId })
      .where("minute_at", ">=", new Date(winFrom))
      .where("minute_at", "<", new Date(winTo))
      .delete();
    for (let i = 0; i < rows.length; i += 2000)
      await trx("rollup_minutes").insert(rows.slice(i, i + 2000));
    winFrom = winTo;
  }

  // The half hours the stretch touches are summed again from their minutes.
  const slotFrom = new Date(floorTo(start, SLOT_MS));
  const slotTo = new Date(ceilTo(end, SLOT_MS));
  await trx("rollup_slots")
    .where({ admission_id: admissionId })
    .where("slot_at", ">=", slotFrom)
    .where("slot_at", "<", slotTo)
    .delete();
  await trx.raw(
    `${SLOTS_FROM_MINUTES} WHERE admission_id = ? AND minute_at >= ? AND minute_at < ? ${SLOTS_GROUP}`,
    [admissionId, slotFrom, slotTo],
  );
}

/**
 * The stretch new readings at [first, last] can change: from the reading
 * before them (whose value they cut short) to where their own values stop
 * holding — a charted value at most 4 h, a monitor sample at most 5 min —
 * and the next monitor sample's carry (its interval may have changed) at
 * most 5 min after it.
 */
export async function refreshAfterReadings(
  trx: Knex.Transaction,
  { admissionId, patientId }: { admissionId: number; patientId: number },
  first: Date,
  last: Date,
  source: "manual" | "monitor",
): Promise<void> {
  const [[[before]], [[nextMonitor]]] = (await Promise.all([
    trx.raw(
      `SELECT taken_at AS t FROM readings ${BY_PATIENT_TIME} WHERE patient_id = ? AND admission_id = ? AND taken_at < ? ORDER BY taken_at DESC LIMIT 1`,
      [patientId, admissionId, first],
    ),
    trx.raw(
      `SELECT taken_at AS t FROM readings ${BY_ADMISSION_SOURCE_TIME} WHERE admission_id = ? AND source = 'monitor' AND patient_id = ? AND taken_at > ? ORDER BY taken_at LIMIT 1`,
      [admissionId, patientId, last],
    ),
  ])) as [[{ t: Date }[]], [{ t: Date }[]]];
  const from = before?.t ?? first;
  const reach =
    last.getTime() + (source === "manual" ? MAX_CARRY_FORWARD_MS : MONITOR_MAX_CARRY_MS);
  const to = nextMonitor?.t
    ? Math.min(reach, nextMonitor.t.getTime() + MONITOR_MAX_CARRY_MS)
    : reach;
  await refreshRollups(trx, admissionId, from, new Date(Math.max(to, last.getTime() + MINUTE_MS)));
}

/**
 * After a change that holds from `at` on (an order written, superseded or
 * discontinued, an adjustment, a move, a discharge): everything from `at` to
 * the furthest a value already charted could still hold.
 */
export async function refreshFrom(
  trx: Knex.Transaction,
  admissionId: number,
  at: Date,
  now: Date,
): Promise<void> {
  const to = Math.max(at.getTime(), now.getTime()) + MAX_CARRY_FORWARD_MS;
  await refreshRollups(trx, admissionId, at, new Date(to));
}

/** `npm run rollups:rebuild`: recomputes every admission's rollups over [from, to), a day per transaction. */
export async function rebuildRollups(
  knex: Knex,
  period: { from: Date; to: Date; admissionIds?: readonly number[] },
): Promise<{ admissions: number }> {
  const q = knex("admissions")
    .where("admitted_at", "<", period.to)
    .where((w) => void w.whereNull("discharged_at").orWhere("discharged_at", ">", period.from))
    .select("id", "admitted_at", "discharged_at");
  if (period.admissionIds) void q.whereIn("id", period.admissionIds);
  const admissions = (await q) as { id: number; admitted_at: Date; discharged_at: Date | null }[];
  const DAY = 24 * HOUR_MS;
  for (const a of admissions) {
    const from = Math.max(period.from.getTime(), floorTo(a.admitted_at.getTime(), MINUTE_MS));
    const to = Math.min(
      period.to.getTime(),
      a.discharged_at ? ceilTo(a.discharged_at.getTime(), MINUTE_MS) : Infinity,
    );
    for (let s = floorTo(from, HOUR_MS); s < to; s += DAY) {
      const e = Math.min(to, s + DAY);
      await transact(knex, (trx) =>
        refreshRollups(trx, a.id, new Date(Math.max(s, from)), new Date(e)),
      );
    }
  }
  return { admissions: admissions.length };
}

/** {@link refreshAfterReadings} for rows just inserted, per admission. */
export async function refreshAfterReadingRows(
  trx: Knex.Transaction,
  rows: readonly {
    admission_id: number;
    patient_id: number;
    taken_at: Date;
    source: "manual" | "monitor";
  }[],
): Promise<void> {
  const spans = new Map<number, { patientId: number; first: Date; last: Date; manual: boolean }>();
  for (const r of rows) {
    const s = spans.get(r.admission_id);
    if (!s)
      spans.set(r.admission_id, {
        patientId: r.patient_id,
        first: r.taken_at,
        last: r.taken_at,
        manual: r.source === "manual",
      });
    else {
      if (r.taken_at < s.first) s.first = r.taken_at;
      if (r.taken_at > s.last) s.last = r.taken_at;
      if (r.source === "manual") s.manual = true;
    }
  }
  for (const [admissionId, { patientId, first, last, manual }] of spans)
    await refreshAfterReadings(
      trx,
      { admissionId, patientId },
      first,
      last,
      manual ? "manual" : "monitor",
    );
}

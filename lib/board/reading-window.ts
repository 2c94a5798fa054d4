import type { Knex } from "knex";

/** One reading as the time-in-band computation needs it (t in ms since epoch). */
export type WindowReading = {
  id: number;
  t: number;
  spo2: number;
  fio2: number;
  flow: number | null;
  source: "manual" | "monitor";
};

type Entry = { readings: WindowReading[]; builtAt: number; usedAt: number };
type Cache = {
  entries: Map<number, Entry>;
  /** Highest reading id seen by each incremental fetch, with when it was seen. */
  marks: { at: number; maxId: number }[];
  /** Ids above the safe mark already merged, so overlapping fetches add nothing twice. */
  recentIds: Set<number>;
};

declare global {
  var tidemarkReadingWindow: Cache | undefined;
}

/**
 * Readings are append-only (lib/readings never updates or deletes one), so the
 * Board keeps each admission's last 24 h (+ carry-in) of readings in memory and
 * on each refresh fetches only the rows added since, by id. A commit can land
 * with a lower id than one already seen, so each fetch starts from the highest
 * id seen at least OVERLAP_MS ago and drops the duplicates. Each admission is
 * also re-read in full every REBUILD_MS as a safety net, and cold admissions
 * (first look, or not looked at for an hour) are read in full.
 */
const OVERLAP_MS = 2 * 60_000;
const REBUILD_MS = 10 * 60_000;
const EVICT_MS = 60 * 60_000;
/** How far `now` may be from the clock for the window to be served from memory. */
const LIVE_TOLERANCE_MS = 5 * 60_000;

function cache(): Cache {
  globalThis.tidemarkReadingWindow ??= { entries: new Map(), marks: [], recentIds: new Set() };
  return globalThis.tidemarkReadingWindow;
}

type Row = {
  id: number | string;
  admission_id: number;
  t: number | string;
  spo2_pct: number;
  fio2: number;
  flow_l_min: number | null;
  source: "manual" | "monitor";
};

async function fetchRows(knex: Knex, where: string, bindings: Knex.RawBinding[]): Promise<Row[]> {
  // Milliseconds since the epoch as plain integers: they parse much faster than
  // DATETIME values when there are tens of thousands of rows.
  const [rows] = (await knex.raw(
    `SELECT id, admission_id, TIMESTAMPDIFF(MICROSECOND, '1970-01-01', taken_at) DIV 1000 AS t, spo2_pct, fio2, flow_l_min, source
       FROM readings WHERE ${where}`,
    bindings,
  )) as [Row[]];
  return rows;
}

const toReading = (r: Row): WindowReading => ({
  id: Number(r.id),
  t: Number(r.t),
  spo2: r.spo2_pct,
  fio2: r.fio2,
  flow: r.flow_l_min,
  source: r.source,
});

async function fetchFull(
  knex: Knex,
  admissions: readonly { admissionId: number; patientId: number }[],
  from: Date,
  to: Date,
): Promise<Map<number, WindowReading[]>> {
  const out = new Map<number, WindowReading[]>(admissions.map((a) => [a.admissionId, []]));
  if (admissions.length === 0) return out;
  const rows = await fetchRows(
    knex,
    `patient_id IN (${admissions.map(() => "?").join(",")}) AND taken_at >= ? AND taken_at <= ?`,
    [...admissions.map((a) => a.patientId), from, to],
  );
  for (const r of rows) out.get(r.admission_id)?.push(toReading(r));
  for (const list of out.values()) list.sort((a, b) => a.t - b.t);
  return out;
}

/**
 * The readings of each admission taken in [from, now], sorted by time. Served
 * from memory when `now` is the present; read in full otherwise.
 */
export async function readingWindow(
  knex: Knex,
  admissions: readonly { admissionId: number; patientId: number }[],
  from: Date,
  now: Date,
): Promise<Map<number, WindowReading[]>> {
  const clock = Date.now();
  if (Math.abs(clock - now.getTime()) > LIVE_TOLERANCE_MS)
    return fetchFull(knex, admissions, from, now);

  const c = cache();
  const lower = from.getTime();
  const upper = now.getTime();
  // The newest id committed before this load starts: every fetch below sees at least that.
  const [[head]] = (await knex.raw("SELECT COALESCE(MAX(id), 0) AS m FROM readings")) as [
    [{ m: number | string }],
  ];
  const headId = Number(head?.m ?? 0);
  const settled = c.marks.filter((m) => m.at <= clock - OVERLAP_MS);
  // Until a mark has settled, start from the earliest one (the first build).
  const safeId = settled.length
    ? Math.max(...settled.map((m) => m.maxId))
    : c.marks.length
      ? Math.min(...c.marks.map((m) => m.maxId))
      : 0;

  // Warm admissions: only what was added since the safe mark.
  const warm = admissions.filter((a) => {
    const e = c.entries.get(a.admissionId);
    return e !== undefined && clock - e.builtAt < REBUILD_MS && c.marks.length > 0;
  });
  const cold = admissions.filter((a) => !warm.includes(a));
  const [fresh, added] = await Promise.all([
    // Cold entries keep a window wide enough for the next refreshes' carry-in.
    fetchFull(knex, cold, from, new Date(clock + 24 * 60 * 60_000)),
    warm.length
      ? fetchRows(knex, `id > ? AND patient_id IN (${warm.map(() => "?").join(",")})`, [
          safeId,
          ...warm.map((a) => a.patientId),
        ])
      : Promise.resolve([] as Row[]),
  ]);

  for (const [admissionId, readings] of fresh) {
    c.entries.set(admissionId, { readings, builtAt: clock, usedAt: clock });
    for (const r of readings) if (r.id > safeId) c.recentIds.add(r.id);
  }
  const touched = new Set<Entry>();
  for (const row of added) {
    const r = toReading(row);
    const entry = c.entries.get(row.admission_id);
    if (!entry || c.recentIds.has(r.id)) continue;
    entry.readings.push(r);
    c.recentIds.add(r.id);
    touched.add(entry);
  }
  for (const entry of touched) entry.readings.sort((a, b) => a.t - b.t);

  // Bookkeeping: the mark of this fetch, old marks and ids below the safe mark, idle entries.
  c.marks.push({ at: clock, maxId: Math.max(headId, safeId) });
  const keepFrom = c.marks.findLastIndex((m) => m.at <= clock - OVERLAP_MS);
  if (keepFrom > 0) c.marks.splice(0, keepFrom);
  for (const id of c.recentIds) if (id <= safeId) c.recentIds.delete(id);
  for (const [id, entry] of c.entries) if (clock - entry.usedAt > EVICT_MS) c.entries.delete(id);

  const out = new Map<number, WindowReading[]>();
  for (const a of admissions) {
    const entry = c.entries.get(a.admissionId);
    if (!entry) continue;
    entry.usedAt = clock;
    // Drop what has slid out of the window for good.
    const firstKept = entry.readings.findIndex((r) => r.t >= lower);
    if (firstKept > 0) entry.readings.splice(0, firstKept);
    else if (firstKept === -1) entry.readings.length = 0;
    // Sorted, so only a reading charted ahead of `now` (clock skew) needs a copy.
    const last = entry.readings[entry.readings.length - 1];
    out.set(
      a.admissionId,
      last && last.t > upper ? entry.readings.filter((r) => r.t <= upper) : entry.readings,
    );
  }
  return out;
}

/**
 * Alert detection: pure, no framework, database or I/O imports. The service
 * feeds it readings as they are charted or imported; the benchmark feeds it a
 * week of 1 Hz monitor data. Both go through {@link advanceWatch}.
 *
 * Rules (DESIGN.md §2 "Excursion"; issue 6):
 * - Below band: SpO2 under the order's lower bound.
 * - Above band: SpO2 over the upper bound while on supplemental oxygen
 *   (FiO2 > 0.21 or any flow). Above the band on room air is not an excursion.
 * - A manually charted value is a clinician's deliberate observation: one
 *   reading out of band opens an excursion, one in band ends it.
 * - Monitor series page nobody for a single artefact: the excursion opens only
 *   once every monitor reading has stayed out of band (same side) for
 *   `sustainMs` (default 60 s), and ends only once back in band for
 *   `resolveMs` (default 5 min) — so a patient hovering at the bound does not
 *   open and close alerts every few seconds.
 * - Urgent grade (below only): SpO2 under `urgentBelowPct` (85 %) or
 *   `urgentMarginPct` (5) points or more under the lower bound. An open
 *   excursion is upgraded the first time a reading meets either.
 * The 85 % figure and the 5-point margin are the issue's own thresholds, in
 * the range units commonly use for "call now" saturation (common practice,
 * not a published cut-off); both are configurable.
 */

export type Direction = "below" | "above";
export type Grade = "routine" | "urgent";
export type ReadingSource = "manual" | "monitor";

export type DetectReading = {
  /** Time taken, ms since the epoch. */
  t: number;
  spo2: number;
  fio2: number;
  flow: number | null;
  source: ReadingSource;
};

export type Band = { lower: number; upper: number };

export type DetectionOptions = {
  sustainMs: number;
  resolveMs: number;
  urgentBelowPct: number;
  urgentMarginPct: number;
};

export const DEFAULT_DETECTION: DetectionOptions = {
  sustainMs: 60_000,
  resolveMs: 5 * 60_000,
  urgentBelowPct: 85,
  urgentMarginPct: 5,
};

/**
 * Where detection stands for one admission between readings. Plain data, so
 * the service can keep it in a row and pick up where the last write left off.
 */
export type WatchState = {
  phase: "idle" | "pending" | "open";
  direction: Direction | null;
  /** When the current (pending or open) excursion began: its first out-of-band reading. */
  since: number | null;
  grade: Grade | null;
  /** The lowest (below) or highest (above) SpO2 of the current excursion. */
  worst: number | null;
  /** While open: since when monitor readings have been back in band. */
  inBandSince: number | null;
  /** The newest reading applied; older ones arriving later do not move the state. */
  lastT: number | null;
};

export const IDLE_WATCH: WatchState = {
  phase: "idle",
  direction: null,
  since: null,
  grade: null,
  worst: null,
  inBandSince: null,
  lastT: null,
};

export type WatchEvent =
  | {
      type: "open";
      direction: Direction;
      startedAt: number;
      at: number;
      grade: Grade;
      spo2: number;
    }
  | { type: "upgrade"; at: number; spo2: number }
  | { type: "resolve"; at: number; direction: Direction; worst: number };

/** Which side of the band a reading is on, or null when it is in band. */
export function classifyReading(
  r: Pick<DetectReading, "spo2" | "fio2" | "flow">,
  band: Band,
): Direction | null {
  if (r.spo2 < band.lower) return "below";
  if (r.spo2 > band.upper && (r.fio2 > 0.21 || (r.flow ?? 0) > 0)) return "above";
  return null;
}

export function gradeOf(
  spo2: number,
  direction: Direction,
  band: Band,
  opts: DetectionOptions,
): Grade {
  if (direction !== "below") return "routine";
  return spo2 < opts.urgentBelowPct || band.lower - spo2 >= opts.urgentMarginPct
    ? "urgent"
    : "routine";
}

/**
 * Applies one reading to the state, mutating it, and reports what changed
 * through `emit`. Readings older than the last one applied are ignored: a
 * backdated value does not reopen the past (the Chart still shows it).
 */
export function advanceWatch(
  state: WatchState,
  r: DetectReading,
  band: Band,
  opts: DetectionOptions,
  emit: (event: WatchEvent) => void,
): void {
  if (state.lastT !== null && r.t < state.lastT) return;
  state.lastT = r.t;
  const side = classifyReading(r, band);

  if (state.phase === "open") {
    if (side !== null && side === state.direction) {
      state.inBandSince = null;
      if (side === "below" ? r.spo2 < state.worst! : r.spo2 > state.worst!) state.worst = r.spo2;
      if (state.grade === "routine" && gradeOf(r.spo2, side, band, opts) === "urgent") {
        state.grade = "urgent";
        emit({ type: "upgrade", at: r.t, spo2: r.spo2 });
      }
      return;
    }
    if (side === null) {
      // Back in band: a manual value ends it now; monitor values must hold.
      if (r.source === "monitor") {
        if (state.inBandSince === null) state.inBandSince = r.t;
        if (r.t - state.inBandSince < opts.resolveMs) return;
      }
      emit({ type: "resolve", at: r.t, direction: state.direction!, worst: state.worst! });
      reset(state, r.t);
      return;
    }
    // The other side of the band: this excursion is over, a new one may begin.
    emit({ type: "resolve", at: r.t, direction: state.direction!, worst: state.worst! });
    reset(state, r.t);
  }

  if (side === null) {
    if (state.phase === "pending") reset(state, r.t);
    return;
  }
  if (state.phase === "pending" && state.direction === side) {
    if (side === "below" ? r.spo2 < state.worst! : r.spo2 > state.worst!) state.worst = r.spo2;
  } else {
    state.phase = "pending";
    state.direction = side;
    state.since = r.t;
    state.worst = r.spo2;
  }
  if (r.source === "manual" || r.t - state.since! >= opts.sustainMs) {
    const grade = gradeOf(state.worst!, side, band, opts);
    state.phase = "open";
    state.grade = grade;
    state.inBandSince = null;
    emit({ type: "open", direction: side, startedAt: state.since!, at: r.t, grade, spo2: r.spo2 });
  }
}

function reset(state: WatchState, t: number): void {
  Object.assign(state, IDLE_WATCH, { lastT: t });
}

export type Excursion = {
  direction: Direction;
  startedAt: number;
  /** When it was confirmed (and an alert would open). */
  openedAt: number;
  grade: Grade;
  /** When the upgrade to urgent happened, if it did after opening. */
  upgradedAt: number | null;
  worst: number;
  resolvedAt: number | null;
};

/**
 * Every excursion in a series of readings under one band — what the
 * service's incremental detection would have raised, in one pass. Readings
 * must be sorted by time.
 */
export function detectExcursions(
  readings: readonly DetectReading[],
  band: Band,
  opts: DetectionOptions = DEFAULT_DETECTION,
  start: WatchState = IDLE_WATCH,
): { excursions: Excursion[]; state: WatchState } {
  const state = { ...start };
  const excursions: Excursion[] = [];
  let current: Excursion | null = null;
  const emit = (e: WatchEvent) => {
    if (e.type === "open") {
      current = {
        direction: e.direction,
        startedAt: e.startedAt,
        openedAt: e.at,
        grade: e.grade,
        upgradedAt: null,
        worst: e.spo2,
        resolvedAt: null,
      };
      excursions.push(current);
    } else if (current) {
      if (e.type === "upgrade") {
        current.grade = "urgent";
        current.upgradedAt = e.at;
      } else {
        current.worst = e.worst;
        current.resolvedAt = e.at;
        current = null;
      }
    }
  };
  for (let i = 0; i < readings.length; i++) advanceWatch(state, readings[i]!, band, opts, emit);
  if (current !== null) (current as Excursion).worst = state.worst ?? (current as Excursion).worst;
  return { excursions, state };
}

/**
 * Order limits exhausted: the patient is below the band and the bedside is
 * already at the order's ceiling for FiO2, PEEP or flow — titrating further
 * needs a new order, so the physician is needed. Returns which limits are at
 * their maximum, or an empty list.
 */
export function exhaustedLimits(
  settings: { fio2: number; fio2Estimated: boolean; peep: number | null; flow: number | null },
  limits: { fio2Max: number; peepMax: number | null; flowMax: number | null },
): ("fio2" | "peep" | "flow")[] {
  const out: ("fio2" | "peep" | "flow")[] = [];
  // An estimated FiO2 (low-flow device) is not a setting; the flow is.
  if (!settings.fio2Estimated && settings.fio2 >= limits.fio2Max - 1e-9) out.push("fio2");
  if (limits.peepMax !== null && settings.peep !== null && settings.peep >= limits.peepMax - 1e-9)
    out.push("peep");
  if (limits.flowMax !== null && settings.flow !== null && settings.flow >= limits.flowMax - 1e-9)
    out.push("flow");
  return out;
}

/**
 * Reassessment overdue: the order's interval has passed since the last
 * reassessment (a charted reading, an adjustment). Returns the minutes past
 * due, or null when not overdue.
 */
export function reassessmentOverdueMinutes(
  lastReassessedAt: number,
  reassessMinutes: number,
  now: number,
): number | null {
  const due = lastReassessedAt + reassessMinutes * 60_000;
  return now > due ? Math.floor((now - due) / 60_000) : null;
}

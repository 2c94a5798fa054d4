import { onSupplementalOxygen } from "../oxygen/oximetry";
import { monitorCarryMs, MONITOR_MAX_CARRY_MS, type ReadingSource } from "../time-in-band";
import {
  ABOVE,
  addSegment,
  BELOW,
  compactWindow,
  emptyWindow,
  IN_BAND,
  measureWindows,
  URGENT,
  type MonitorWindow,
  type SegmentCode,
  type WindowMeasure,
} from "./monitor-window";

/**
 * Alert detection: pure, no framework, database or I/O imports. The service
 * feeds it readings as they are charted or imported, and the worker asks it
 * about silence; the benchmark feeds it a week of 1 Hz monitor data. All go
 * through {@link advanceWatch} and {@link checkSignal}.
 *
 * Rules (README "Alerts and e-mail" says them in a nurse's words):
 * - Below band: SpO2 under the order's lower bound. Above band: over the upper
 *   bound while on supplemental oxygen (FiO2 > 0.21 or any flow — the rule
 *   time in band uses). Every SpO2 0–100 % counts, however low.
 * - A charted (manual) value is a clinician's deliberate observation: one
 *   value out of band opens an excursion at once. A charted value in band
 *   closes an excursion that a charted value opened.
 * - A monitor series opens an excursion when, within the last `sustainMs`
 *   (60 s), at least `sustainShare` (80 %) of the monitored time was out of
 *   band on one side, with at least half of the window monitored. A sample
 *   holds until the next one for a few sample intervals (time in band's
 *   carry rule), so a sparse series (one sample every few minutes) confirms on
 *   its second out-of-band sample and a 1 Hz series within the minute; one
 *   in-band blip does not reset anything.
 * - Fast path: at urgent depth (below `urgentBelowPct`, 85 %, or
 *   `urgentMarginPct`, 5 points, or more under the band) the same rule over
 *   the last `urgentSustainMs` (15 s) opens an urgent excursion. A routine
 *   excursion is upgraded the same way (a charted urgent value upgrades at once).
 * - An excursion the monitor confirmed closes only on monitor values held in
 *   band for `resolveMs` (5 min) without a gap, or by a clinician's close with
 *   a reason: an in-band spot check is reported (for that reason), not
 *   allowed to close it, so the monitor cannot reopen it a minute later.
 * - Signal loss: while an excursion is pending or open, a monitor series that
 *   stops for longer than `signalLossMs` (120 s; twice the sample interval for
 *   a sparse series) raises its own alert; a pending excursion then ends, so
 *   nothing waits forever. The next monitor sample (or a charted value)
 *   restores the signal.
 * The 85 % figure and the 5-point margin are thresholds in the range units
 * commonly use for "call now" saturation (common practice, not a published
 * cut-off); every figure is configurable.
 */

export type Direction = "below" | "above";
export type Grade = "routine" | "urgent";
export type { ReadingSource };

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
  /** The sliding window a monitor series is judged over. */
  sustainMs: number;
  /** Share of the window's monitored time that must be out of band. */
  sustainShare: number;
  /** The shorter window of the urgent fast path. */
  urgentSustainMs: number;
  resolveMs: number;
  urgentBelowPct: number;
  urgentMarginPct: number;
  /** Silence of a monitor series, while an excursion is pending or open, that counts as signal loss. */
  signalLossMs: number;
};

export const DEFAULT_DETECTION: DetectionOptions = {
  sustainMs: 60_000,
  sustainShare: 0.8,
  urgentSustainMs: 15_000,
  resolveMs: 5 * 60_000,
  urgentBelowPct: 85,
  urgentMarginPct: 5,
  signalLossMs: 120_000,
};

/** At least this share of a window must be monitored before it can confirm anything. */
export const MIN_MONITORED_SHARE = 0.5;

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
  /** Which kind of reading opened the open excursion. */
  openedBy: ReadingSource | null;
  /** The monitor has confirmed the open excursion: only the monitor (or a clinician) closes it. */
  monitorConfirmed: boolean;
  /** Since when monitor readings have been back in band without a gap (pending or open). */
  inBandSince: number | null;
  /** The newest reading applied; older ones arriving later do not move the state. */
  lastT: number | null;
  /** The newest monitor sample: its time, what it showed, and the interval before it (null: unknown). */
  monitor: { t: number; code: SegmentCode; intervalMs: number | null } | null;
  /** When signal loss was raised for the current silence; null while the signal is there. */
  signalLostAt: number | null;
  window: MonitorWindow;
};

/** A fresh state; never share one between admissions (the window is mutable). */
export function idleWatch(): WatchState {
  return {
    phase: "idle",
    direction: null,
    since: null,
    grade: null,
    worst: null,
    openedBy: null,
    monitorConfirmed: false,
    inBandSince: null,
    lastT: null,
    monitor: null,
    signalLostAt: null,
    window: emptyWindow(),
  };
}

/** A state read back from storage, with the fields an older version did not keep filled in. */
export function restoreWatch(stored: Partial<WatchState>): WatchState {
  const state = { ...idleWatch(), ...stored };
  if (!stored.window) state.window = emptyWindow();
  return state;
}

/** The state as stored: segments no window counts any more are dropped. */
export function storableWatch(state: WatchState): WatchState {
  compactWindow(state.window);
  return state;
}

export type ResolvedBy = "monitor" | "manual" | "other-side";

export type WatchEvent =
  | {
      type: "open";
      direction: Direction;
      startedAt: number;
      at: number;
      grade: Grade;
      spo2: number;
      source: ReadingSource;
    }
  | { type: "upgrade"; at: number; spo2: number; source: ReadingSource }
  | { type: "resolve"; at: number; direction: Direction; worst: number; by: ResolvedBy }
  /** A charted value in band while a monitor-confirmed excursion stays open. */
  | { type: "spot-check"; at: number; spo2: number }
  | {
      type: "signal-lost";
      at: number;
      lastSampleAt: number;
      phase: "pending" | "open";
      direction: Direction;
      since: number;
      worst: number;
      /** The open excursion's grade; for a pending one, the grade its worst value has. */
      grade: Grade;
    }
  | { type: "signal-restored"; at: number; source: ReadingSource };

/** Which side of the band a reading is on, or null when it is in band. */
export function classifyReading(
  r: Pick<DetectReading, "spo2" | "fio2" | "flow">,
  band: Band,
): Direction | null {
  if (r.spo2 < band.lower) return "below";
  if (r.spo2 > band.upper && onSupplementalOxygen(r)) return "above";
  return null;
}

/** Urgent depth: under the absolute threshold, or the margin or more under the band. */
export function isUrgentDepth(spo2: number, band: Band, opts: DetectionOptions): boolean {
  return spo2 < opts.urgentBelowPct || band.lower - spo2 >= opts.urgentMarginPct;
}

export function gradeOf(
  spo2: number,
  direction: Direction,
  band: Band,
  opts: DetectionOptions,
): Grade {
  return direction === "below" && isUrgentDepth(spo2, band, opts) ? "urgent" : "routine";
}

function codeOf(
  side: Direction | null,
  spo2: number,
  band: Band,
  opts: DetectionOptions,
): SegmentCode {
  if (side === null) return IN_BAND;
  if (side === "above") return ABOVE;
  return isUrgentDepth(spo2, band, opts) ? URGENT : BELOW;
}

function enough(m: WindowMeasure, windowMs: number): boolean {
  return m.monitored >= MIN_MONITORED_SHARE * windowMs;
}

/** The sustain rule on one side. */
function sustained(m: WindowMeasure, side: Direction, opts: DetectionOptions): boolean {
  const out = side === "below" ? m.below : m.above;
  return out > 0 && enough(m, opts.sustainMs) && out >= opts.sustainShare * m.monitored;
}

/** The urgent fast path. */
function urgentSustained(m: WindowMeasure, opts: DetectionOptions): boolean {
  return (
    m.urgent > 0 && enough(m, opts.urgentSustainMs) && m.urgent >= opts.sustainShare * m.monitored
  );
}

/** How long a silence must last to count as signal loss: 120 s, or two sample intervals of a sparse series. */
export function signalLossAfterMs(state: WatchState, opts: DetectionOptions): number {
  return Math.max(opts.signalLossMs, 2 * (state.monitor?.intervalMs ?? 0));
}

function worse(direction: Direction, a: number, b: number): number {
  return direction === "below" ? Math.min(a, b) : Math.max(a, b);
}

/** Ends the current excursion (pending or open); the monitor's history stays. */
function endExcursion(state: WatchState): void {
  state.phase = "idle";
  state.direction = null;
  state.since = null;
  state.grade = null;
  state.worst = null;
  state.openedBy = null;
  state.monitorConfirmed = false;
  state.inBandSince = null;
}

/**
 * A clinician closed the excursion by hand (or the order that set the band
 * ended): detection starts afresh — the monitor's earlier time out of band no
 * longer counts, so another excursion needs a fresh half window out of band.
 */
export function restartWatch(state: WatchState): void {
  endExcursion(state);
  state.window = emptyWindow();
  state.monitor = null;
}

function openExcursion(
  state: WatchState,
  direction: Direction,
  since: number,
  r: DetectReading,
  grade: Grade,
  emit: (event: WatchEvent) => void,
): void {
  state.phase = "open";
  state.direction = direction;
  state.since = since;
  state.grade = grade;
  state.openedBy = r.source;
  state.monitorConfirmed = r.source === "monitor";
  state.inBandSince = null;
  emit({
    type: "open",
    direction,
    startedAt: since,
    at: r.t,
    grade,
    spo2: r.spo2,
    source: r.source,
  });
}

function resolveExcursion(
  state: WatchState,
  at: number,
  by: ResolvedBy,
  emit: (event: WatchEvent) => void,
): void {
  emit({ type: "resolve", at, direction: state.direction!, worst: state.worst!, by });
  endExcursion(state);
}

function raiseSignalLoss(
  state: WatchState,
  at: number,
  band: Band,
  opts: DetectionOptions,
  emit: (event: WatchEvent) => void,
): void {
  emit({
    type: "signal-lost",
    at,
    lastSampleAt: state.monitor!.t,
    phase: state.phase as "pending" | "open",
    direction: state.direction!,
    since: state.since!,
    worst: state.worst!,
    grade: state.grade ?? gradeOf(state.worst!, state.direction!, band, opts),
  });
  state.signalLostAt = at;
  // A pending excursion cannot be confirmed without a signal: it ends here, reported with the loss.
  if (state.phase === "pending") endExcursion(state);
}

/** Signal loss applies to an excursion the monitor is part of. */
function watchingMonitor(state: WatchState): boolean {
  if (state.monitor === null || state.signalLostAt !== null) return false;
  if (state.phase === "pending") return true;
  return state.phase === "open" && state.monitor.t >= state.since!;
}

/**
 * The worker's question at `now`: has the monitor gone silent while an
 * excursion is pending or open? Raises signal loss once per silence.
 */
export function checkSignal(
  state: WatchState,
  now: number,
  band: Band,
  opts: DetectionOptions,
  emit: (event: WatchEvent) => void,
): void {
  if (!watchingMonitor(state)) return;
  const lossAt = state.monitor!.t + signalLossAfterMs(state, opts);
  if (now >= lossAt) raiseSignalLoss(state, lossAt, band, opts, emit);
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
  if (r.source === "monitor") applyMonitorSample(state, r, band, opts, emit);
  else applyChartedValue(state, r, band, opts, emit);
}

function applyChartedValue(
  state: WatchState,
  r: DetectReading,
  band: Band,
  opts: DetectionOptions,
  emit: (event: WatchEvent) => void,
): void {
  if (state.signalLostAt !== null) {
    // Someone is at the bedside: the silence is answered. A monitor that
    // comes back later starts as a new series.
    emit({ type: "signal-restored", at: r.t, source: "manual" });
    state.signalLostAt = null;
    state.monitor = null;
  }
  const side = classifyReading(r, band);
  if (state.phase !== "open") {
    if (side === null) return; // a pending monitor excursion is the monitor's to confirm or drop
    const continues = state.phase === "pending" && state.direction === side;
    const since = continues ? state.since! : r.t;
    state.worst = continues ? worse(side, state.worst!, r.spo2) : r.spo2;
    openExcursion(state, side, since, r, gradeOf(r.spo2, side, band, opts), emit);
    return;
  }
  if (side !== null && side === state.direction) {
    state.worst = worse(side, state.worst!, r.spo2);
    if (state.grade === "routine" && gradeOf(r.spo2, side, band, opts) === "urgent") {
      state.grade = "urgent";
      emit({ type: "upgrade", at: r.t, spo2: r.spo2, source: "manual" });
    }
    return;
  }
  if (state.monitorConfirmed) {
    emit({ type: "spot-check", at: r.t, spo2: r.spo2 });
    return;
  }
  resolveExcursion(state, r.t, "manual", emit);
  if (side !== null) {
    state.worst = r.spo2;
    openExcursion(state, side, r.t, r, gradeOf(r.spo2, side, band, opts), emit);
  }
}

function applyMonitorSample(
  state: WatchState,
  r: DetectReading,
  band: Band,
  opts: DetectionOptions,
  emit: (event: WatchEvent) => void,
): void {
  const prev = state.monitor;
  const gap = prev === null ? null : r.t - prev.t;
  if (prev !== null) {
    const end = Math.min(r.t, prev.t + monitorCarryMs(prev.intervalMs));
    addSegment(state.window, prev.t, end, prev.code);
    // A gap breaks a run back in band.
    if (end < r.t) state.inBandSince = null;
  }
  if (state.signalLostAt !== null) {
    emit({ type: "signal-restored", at: r.t, source: "monitor" });
    state.signalLostAt = null;
  } else if (gap !== null && watchingMonitor(state) && gap >= signalLossAfterMs(state, opts)) {
    // A silence nobody was told about (a file imported afterwards): record it.
    raiseSignalLoss(state, prev!.t + signalLossAfterMs(state, opts), band, opts, emit);
    emit({ type: "signal-restored", at: r.t, source: "monitor" });
    state.signalLostAt = null;
  }
  const side = classifyReading(r, band);
  const code = codeOf(side, r.spo2, band, opts);
  const intervalMs = gap !== null && gap <= MONITOR_MAX_CARRY_MS ? gap : null;
  // In place: one object per admission, not one per sample.
  if (state.monitor === null) state.monitor = { t: r.t, code, intervalMs };
  else {
    state.monitor.t = r.t;
    state.monitor.code = code;
    state.monitor.intervalMs = intervalMs;
  }
  const { long, short } = measureWindows(state.window, r.t, opts.sustainMs, opts.urgentSustainMs);
  const urgentNow = urgentSustained(short, opts);

  if (state.phase === "open") {
    const direction = state.direction!;
    if (side === direction) {
      state.inBandSince = null;
      state.worst = worse(direction, state.worst!, r.spo2);
      if (sustained(long, direction, opts) || (direction === "below" && urgentNow))
        state.monitorConfirmed = true;
      if (state.grade === "routine" && direction === "below" && urgentNow) {
        state.grade = "urgent";
        emit({ type: "upgrade", at: r.t, spo2: r.spo2, source: "monitor" });
      }
      return;
    }
    if (side === null) {
      state.inBandSince ??= r.t;
      if (r.t - state.inBandSince >= opts.resolveMs) resolveExcursion(state, r.t, "monitor", emit);
      return;
    }
    // The other side of the band: once that is sustained, this excursion is over.
    state.inBandSince = null;
    if (!sustained(long, side, opts) && !(side === "below" && urgentNow)) return;
    resolveExcursion(state, r.t, "other-side", emit);
  }

  if (side === null) {
    // A pending excursion ends once the monitor has been back in band for
    // longer than the window's in-band allowance (12 of 60 s): a blip does
    // not end it, a recovery does. Its time out of band stays in the window.
    if (state.phase === "pending") {
      state.inBandSince ??= r.t;
      const allowance = (1 - opts.sustainShare) * opts.sustainMs;
      const out = state.direction === "below" ? long.below : long.above;
      if (out === 0 || r.t - state.inBandSince > allowance) endExcursion(state);
    }
    return;
  }
  state.inBandSince = null;
  if (state.phase === "pending" && state.direction === side) {
    state.worst = worse(side, state.worst!, r.spo2);
  } else {
    state.phase = "pending";
    state.direction = side;
    state.since = r.t;
    state.worst = r.spo2;
  }
  const fast = side === "below" && urgentNow;
  if (fast || sustained(long, side, opts)) {
    openExcursion(state, side, state.since!, r, fast ? "urgent" : "routine", emit);
  }
}

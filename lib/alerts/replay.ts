import {
  advanceWatch,
  checkSignal,
  DEFAULT_DETECTION,
  idleWatch,
  type Band,
  type DetectionOptions,
  type DetectReading,
  type Direction,
  type Grade,
  type ReadingSource,
  type ResolvedBy,
  type WatchEvent,
  type WatchState,
} from "./detect";

// One pass of the detection rules over a whole series: what the service's
// incremental detection would have raised. For the tests and the benchmark.

export type Excursion = {
  direction: Direction;
  startedAt: number;
  /** When it was confirmed (and an alert would open). */
  openedAt: number;
  openedBy: ReadingSource;
  grade: Grade;
  /** When the upgrade to urgent happened, if it did after opening. */
  upgradedAt: number | null;
  worst: number;
  resolvedAt: number | null;
  resolvedBy: ResolvedBy | null;
  /** Charted values in band that did not close it (it was monitor-confirmed). */
  spotChecks: number;
};

export type SignalLoss = {
  at: number;
  lastSampleAt: number;
  phase: "pending" | "open";
  restoredAt: number | null;
};

/**
 * Every excursion and signal loss in a series of readings under one band —
 * what the service's incremental detection would have raised, in one pass.
 * Readings must be sorted by time. With `until`, the series is also asked
 * about silence at that moment, as the worker would.
 */
export function detectExcursions(
  readings: readonly DetectReading[],
  band: Band,
  opts: DetectionOptions = DEFAULT_DETECTION,
  options: { start?: WatchState; until?: number } = {},
): { excursions: Excursion[]; signalLosses: SignalLoss[]; state: WatchState } {
  const state = options.start ?? idleWatch();
  const excursions: Excursion[] = [];
  const signalLosses: SignalLoss[] = [];
  let current: Excursion | null = null;
  const emit = (e: WatchEvent) => {
    switch (e.type) {
      case "open":
        current = {
          direction: e.direction,
          startedAt: e.startedAt,
          openedAt: e.at,
          openedBy: e.source,
          grade: e.grade,
          upgradedAt: null,
          worst: e.spo2,
          resolvedAt: null,
          resolvedBy: null,
          spotChecks: 0,
        };
        excursions.push(current);
        break;
      case "upgrade":
        if (current) {
          current.grade = "urgent";
          current.upgradedAt = e.at;
        }
        break;
      case "spot-check":
        if (current) current.spotChecks++;
        break;
      case "resolve":
        if (current) {
          current.worst = e.worst;
          current.resolvedAt = e.at;
          current.resolvedBy = e.by;
          current = null;
        }
        break;
      case "signal-lost":
        signalLosses.push({
          at: e.at,
          lastSampleAt: e.lastSampleAt,
          phase: e.phase,
          restoredAt: null,
        });
        break;
      case "signal-restored": {
        const last = signalLosses[signalLosses.length - 1];
        if (last && last.restoredAt === null) last.restoredAt = e.at;
        break;
      }
    }
  };
  for (let i = 0; i < readings.length; i++) advanceWatch(state, readings[i]!, band, opts, emit);
  if (options.until !== undefined) checkSignal(state, options.until, band, opts, emit);
  if (current !== null) (current as Excursion).worst = state.worst ?? (current as Excursion).worst;
  return { excursions, signalLosses, state };
}

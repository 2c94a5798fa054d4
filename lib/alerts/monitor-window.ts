/**
 * The monitored time of one admission's SpO2 series, as consecutive segments,
 * with running sums over two sliding windows (the sustain window and the
 * shorter urgent window). Pure data, so it lives inside the stored watch
 * state; every operation is amortised O(1) per sample, which keeps a week of
 * 1 Hz samples well inside the detection benchmark.
 *
 * Each monitor sample holds from its time until the next sample, for at most
 * its carry (lib/time-in-band monitorCarryMs); time beyond that is a gap and
 * belongs to no segment.
 */

/** What a stretch of monitored time was: in band, below (not urgent), below at urgent depth, above. */
export const IN_BAND = 0;
export const BELOW = 1;
export const URGENT = 2;
export const ABOVE = 3;
export type SegmentCode = typeof IN_BAND | typeof BELOW | typeof URGENT | typeof ABOVE;

/** Running sums of one window over the segments from `first` on. */
export type WindowSums = {
  /** Index (a multiple of 3) of the first segment that may still overlap the window. */
  first: number;
  /** Milliseconds per code, over the segments from `first` on. */
  ms: [number, number, number, number];
};

export type MonitorWindow = {
  /** Flat [start, end, code, start, end, code, …], oldest first, ms since the epoch. */
  segs: number[];
  long: WindowSums;
  short: WindowSums;
};

/** What one window holds at a moment: out-of-band time per side and the monitored time. */
export type WindowMeasure = {
  below: number;
  urgent: number;
  above: number;
  monitored: number;
};

export function emptyWindow(): MonitorWindow {
  return { segs: [], long: { first: 0, ms: [0, 0, 0, 0] }, short: { first: 0, ms: [0, 0, 0, 0] } };
}

/** Appends monitored time [start, end) of one code, merging with the last segment when contiguous. */
export function addSegment(w: MonitorWindow, start: number, end: number, code: SegmentCode): void {
  if (end <= start) return;
  const n = w.segs.length;
  const len = end - start;
  // Merge only while the last segment still counts in both windows' sums.
  if (n >= 3 && w.segs[n - 1] === code && w.segs[n - 2] === start && n - 3 >= w.short.first) {
    w.segs[n - 2] = end;
  } else {
    w.segs.push(start, end, code);
  }
  w.long.ms[code] += len;
  w.short.ms[code] += len;
}

function advance(w: MonitorWindow, sums: WindowSums, from: number): void {
  const segs = w.segs;
  while (sums.first < segs.length && segs[sums.first + 1]! <= from) {
    const code = segs[sums.first + 2]! as SegmentCode;
    sums.ms[code] -= segs[sums.first + 1]! - segs[sums.first]!;
    sums.first += 3;
  }
}

function measureInto(
  w: MonitorWindow,
  sums: WindowSums,
  from: number,
  out: WindowMeasure,
): WindowMeasure {
  const ms = sums.ms;
  let inBand = ms[IN_BAND];
  let below = ms[BELOW];
  let urgent = ms[URGENT];
  let above = ms[ABOVE];
  // The first segment may straddle the window's start: leave out its older part.
  if (sums.first < w.segs.length && w.segs[sums.first]! < from) {
    const older = from - w.segs[sums.first]!;
    const code = w.segs[sums.first + 2]!;
    if (code === IN_BAND) inBand -= older;
    else if (code === BELOW) below -= older;
    else if (code === URGENT) urgent -= older;
    else above -= older;
  }
  out.below = below + urgent;
  out.urgent = urgent;
  out.above = above;
  out.monitored = inBand + below + urgent + above;
  return out;
}

// Reused on every sample (detection runs synchronously): a week of 1 Hz
// samples must not allocate three objects per sample.
const scratch = {
  long: { below: 0, urgent: 0, above: 0, monitored: 0 } as WindowMeasure,
  short: { below: 0, urgent: 0, above: 0, monitored: 0 } as WindowMeasure,
};

/**
 * Both windows ending at `now`: the sustain window (`longMs`) and the urgent
 * one (`shortMs`). The answer is overwritten by the next call: read it at once.
 */
export function measureWindows(
  w: MonitorWindow,
  now: number,
  longMs: number,
  shortMs: number,
): { readonly long: WindowMeasure; readonly short: WindowMeasure } {
  advance(w, w.long, now - longMs);
  advance(w, w.short, now - shortMs);
  // Drop segments both windows have left, now and then, so the stored state stays small.
  if (w.long.first >= 48) compactWindow(w);
  measureInto(w, w.long, now - longMs, scratch.long);
  measureInto(w, w.short, now - shortMs, scratch.short);
  return scratch;
}

/** Removes segments that no window counts any more. */
export function compactWindow(w: MonitorWindow): void {
  const drop = Math.min(w.long.first, w.short.first);
  if (drop === 0) return;
  w.segs.splice(0, drop);
  w.long.first -= drop;
  w.short.first -= drop;
}

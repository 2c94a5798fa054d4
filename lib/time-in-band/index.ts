import { onSupplementalOxygen } from "../oxygen/oximetry";

/**
 * Time in band: the share of a period a patient's SpO2 spent below, inside and
 * above the target band of the order in effect at each moment, and the share
 * nobody knew. Pure — no framework, database or I/O imports — so the Board,
 * the Chart, alert detection and the tests share one implementation.
 *
 * Rules:
 * - A reading's value holds from its time until the next reading, but only as
 *   long as it can honestly stand for the patient; the rest is unknown:
 *   - a monitor sample for a few sample intervals ({@link monitorCarryMs}: three
 *     times the gap since the series' previous sample, at most 5 min), so a
 *     probe taken off leaves a gap, not a flat line;
 *   - a charted (manual) value until the order's reassessment interval has
 *     passed, at most 4 h ({@link manualCarryMs}).
 *   A reading taken before the period starts is carried into it under the
 *   same rules.
 * - The band is the one of the order in effect at that moment; time with no
 *   order in effect counts as unknown.
 * - Excursion (DEVELOPERS.md, "The product's words"): below the lower bound, or above the upper bound
 *   while on supplemental oxygen (FiO2 > 0.21 or any flow, the rule alert
 *   detection uses). Above the upper bound on room air counts as in band.
 */

/** Longest time one charted value is assumed to hold (4 h, the longest usual ward observation interval; common practice). */
export const MAX_CARRY_FORWARD_MS = 4 * 60 * 60 * 1000;
/** Longest time one monitor sample is assumed to hold (5 min). */
export const MONITOR_MAX_CARRY_MS = 5 * 60 * 1000;
/** A monitor sample holds for this many of the series' sample intervals. */
export const MONITOR_CARRY_INTERVALS = 3;

/**
 * How long a monitor sample holds, from the gap since the series' previous
 * sample: three intervals (a 1 Hz series: 3 s; one sample a minute: 3 min),
 * never more than 5 min. With no previous sample, or after a gap longer than
 * 5 min (a new series), the interval is unknown and the sample holds 5 min —
 * the next sample ends it sooner in a live series.
 */
export function monitorCarryMs(intervalMs: number | null): number {
  if (intervalMs === null || intervalMs > MONITOR_MAX_CARRY_MS) return MONITOR_MAX_CARRY_MS;
  return Math.min(MONITOR_MAX_CARRY_MS, MONITOR_CARRY_INTERVALS * Math.max(intervalMs, 1000));
}

/** How long a charted value holds: the order's reassessment interval, at most 4 h. */
export function manualCarryMs(reassessMinutes: number | null | undefined): number {
  if (reassessMinutes === null || reassessMinutes === undefined || reassessMinutes <= 0)
    return MAX_CARRY_FORWARD_MS;
  return Math.min(MAX_CARRY_FORWARD_MS, reassessMinutes * 60_000);
}

export type ReadingSource = "manual" | "monitor";
export type BandReading = {
  at: Date;
  spo2: number;
  fio2: number;
  flow: number | null;
  source: ReadingSource;
};
/** One order's band over its time in effect; `reassessMinutes` bounds how long a charted value holds. */
export type BandPeriod = {
  from: Date;
  to: Date | null;
  lower: number;
  upper: number;
  reassessMinutes?: number | null;
};
export type BandClass = "below" | "inBand" | "above";

export type TimeInBand = {
  /** Fractions of the period (0…1); the four add up to 1 for a non-empty period. */
  below: number;
  inBand: number;
  above: number;
  unknown: number;
  /** The same, in milliseconds. */
  ms: { period: number; below: number; inBand: number; above: number; unknown: number };
};

/** Where one SpO2 value stands against a band (the excursion rule above). */
export function classifySpo2(
  spo2: number,
  setting: { fio2: number; flow?: number | null },
  band: { lower: number; upper: number },
): BandClass {
  if (spo2 < band.lower) return "below";
  if (spo2 > band.upper && onSupplementalOxygen(setting)) return "above";
  return "inBand";
}

/**
 * Splits the period [from, to) into below / in band / above / unknown time.
 * Readings and bands need not be sorted; bands are expected not to overlap
 * (one order in effect at a time) — if they do, the earlier-starting one wins.
 */
export function timeInBand(input: {
  readings: readonly BandReading[];
  bands: readonly BandPeriod[];
  from: Date;
  to: Date;
}): TimeInBand {
  const series = input.readings
    .map((r) => ({ t: r.at.getTime(), spo2: r.spo2, fio2: r.fio2, flow: r.flow, source: r.source }))
    .sort((a, b) => a.t - b.t);
  return timeInBandOfSeries({
    ...input,
    series,
    from: input.from.getTime(),
    to: input.to.getTime(),
  });
}

/** One reading as {@link timeInBandOfSeries} takes it (t in ms since the epoch). */
export type SeriesReading = {
  t: number;
  spo2: number;
  fio2: number;
  flow: number | null;
  source: ReadingSource;
};

/** One classified piece of the series: [from, to) held at `spo2` under `band`. */
export type HeldPiece = {
  from: number;
  to: number;
  spo2: number;
  lower: number;
  upper: number;
  cls: BandClass;
};

/**
 * Walks the series over [from, to) and calls `visit` for each piece of time
 * a reading held under one band (the carry rules above), in time order. The
 * one place the rules live: time in band sums the pieces, the rollups split
 * them into minutes.
 */
export function walkHeldSeries(
  input: {
    series: readonly SeriesReading[];
    bands: readonly BandPeriod[];
    from: number;
    to: number;
  },
  visit: (piece: HeldPiece) => void,
): void {
  const { series: readings, from: start, to: end } = input;
  if (end <= start) return;
  const bands = [...input.bands]
    .map((b) => ({
      from: b.from.getTime(),
      to: b.to ? b.to.getTime() : Infinity,
      lower: b.lower,
      upper: b.upper,
      manualCarry: manualCarryMs(b.reassessMinutes),
    }))
    .sort((a, b) => a.from - b.from);
  let previousMonitorT: number | null = null;
  const n = readings.length;
  for (let i = 0; i < n; i++) {
    const r = readings[i]!;
    const at = r.t;
    if (at >= end) break;
    let carry: number;
    if (r.source === "monitor") {
      carry = monitorCarryMs(previousMonitorT === null ? null : at - previousMonitorT);
      previousMonitorT = at;
    } else {
      carry = MAX_CARRY_FORWARD_MS;
      // The order in effect when the value was charted sets how long it holds.
      for (const band of bands) {
        if (band.from > at) break;
        if (at < band.to) carry = band.manualCarry;
      }
    }
    const next = i + 1 < n ? readings[i + 1]!.t : Infinity;
    const segStart = at > start ? at : start;
    let segEnd = at + carry;
    if (next < segEnd) segEnd = next;
    if (end < segEnd) segEnd = end;
    if (segEnd <= segStart) continue;
    const onOxygen = onSupplementalOxygen(r);
    // Split the reading's segment by the bands in effect during it.
    let cursor = segStart;
    for (const band of bands) {
      if (band.from >= segEnd) break;
      const s = cursor > band.from ? cursor : band.from;
      const e = segEnd < band.to ? segEnd : band.to;
      if (e <= s) continue;
      // The excursion rule, as in classifySpo2.
      const cls: BandClass =
        r.spo2 < band.lower ? "below" : r.spo2 > band.upper && onOxygen ? "above" : "inBand";
      visit({ from: s, to: e, spo2: r.spo2, lower: band.lower, upper: band.upper, cls });
      cursor = e;
    }
  }
}

/**
 * The same computation over readings already sorted by time, with times in
 * milliseconds — for callers holding many readings, so they need not build a
 * Date per reading. {@link timeInBand} is a wrapper around it.
 */
export function timeInBandOfSeries(input: {
  series: readonly SeriesReading[];
  bands: readonly BandPeriod[];
  from: number;
  to: number;
}): TimeInBand {
  const period = Math.max(0, input.to - input.from);
  const sums = { below: 0, inBand: 0, above: 0 };
  walkHeldSeries(input, (p) => {
    sums[p.cls] += p.to - p.from;
  });
  const unknown = Math.max(0, period - sums.below - sums.inBand - sums.above);
  const share = (ms: number) => (period > 0 ? ms / period : 0);
  return {
    below: share(sums.below),
    inBand: share(sums.inBand),
    above: share(sums.above),
    unknown: period > 0 ? share(unknown) : 0,
    ms: { period, ...sums, unknown },
  };
}

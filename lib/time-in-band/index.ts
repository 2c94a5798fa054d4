/**
 * Time in band: the share of a period a patient's SpO2 spent below, inside and
 * above the target band of the order in effect at each moment. Pure — no
 * framework, database or I/O imports — so the Board, the Chart and the tests
 * share one implementation.
 *
 * Rules:
 * - A reading's value holds from its time until the next reading, but for at
 *   most {@link MAX_CARRY_FORWARD_MS} (4 h, the longest usual ward observation
 *   interval); time after that counts as unknown. A reading taken before the
 *   period starts is carried into it under the same rule.
 * - The band is the one of the order in effect at that moment; time with no
 *   order in effect counts as unknown.
 * - Excursion (DESIGN.md §2): below the lower bound, or above the upper bound
 *   while on FiO2 > 0.21. Above the upper bound on room air counts as in band.
 */

/** Longest time one reading is assumed to hold (4 h). */
export const MAX_CARRY_FORWARD_MS = 4 * 60 * 60 * 1000;

export type BandReading = { at: Date; spo2: number; fio2: number };
export type BandPeriod = { from: Date; to: Date | null; lower: number; upper: number };
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
  fio2: number,
  band: { lower: number; upper: number },
): BandClass {
  if (spo2 < band.lower) return "below";
  if (spo2 > band.upper && fio2 > 0.21) return "above";
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
  maxCarryForwardMs?: number;
}): TimeInBand {
  const series = input.readings
    .map((r) => ({ t: r.at.getTime(), spo2: r.spo2, fio2: r.fio2 }))
    .sort((a, b) => a.t - b.t);
  return timeInBandOfSeries({
    ...input,
    series,
    from: input.from.getTime(),
    to: input.to.getTime(),
  });
}

/**
 * The same computation over readings already sorted by time, with times in
 * milliseconds — for callers holding many readings (the Board), so they need
 * not build a Date per reading. {@link timeInBand} is a wrapper around it.
 */
export function timeInBandOfSeries(input: {
  series: readonly { t: number; spo2: number; fio2: number }[];
  bands: readonly BandPeriod[];
  from: number;
  to: number;
  maxCarryForwardMs?: number;
}): TimeInBand {
  const { series: readings, from: start, to: end } = input;
  const carry = input.maxCarryForwardMs ?? MAX_CARRY_FORWARD_MS;
  const period = Math.max(0, end - start);
  const bands = [...input.bands]
    .map((b) => ({
      from: b.from.getTime(),
      to: b.to ? b.to.getTime() : Infinity,
      lower: b.lower,
      upper: b.upper,
    }))
    .sort((a, b) => a.from - b.from);
  // Plain numeric locals: the Board runs this over ~100k readings per refresh.
  let below = 0;
  let inBand = 0;
  let above = 0;
  const n = period > 0 ? readings.length : 0;
  for (let i = 0; i < n; i++) {
    const r = readings[i]!;
    const at = r.t;
    if (at >= end) break;
    const next = i + 1 < n ? readings[i + 1]!.t : Infinity;
    const segStart = at > start ? at : start;
    let segEnd = at + carry;
    if (next < segEnd) segEnd = next;
    if (end < segEnd) segEnd = end;
    if (segEnd <= segStart) continue;
    // Split the reading's segment by the bands in effect during it.
    let cursor = segStart;
    for (const band of bands) {
      if (band.from >= segEnd) break;
      const s = cursor > band.from ? cursor : band.from;
      const e = segEnd < band.to ? segEnd : band.to;
      if (e <= s) continue;
      // The excursion rule, as in classifySpo2.
      if (r.spo2 < band.lower) below += e - s;
      else if (r.spo2 > band.upper && r.fio2 > 0.21) above += e - s;
      else inBand += e - s;
      cursor = e;
    }
  }
  const sums = { below, inBand, above };

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

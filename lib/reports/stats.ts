import { quantileSorted } from "simple-statistics";
import type { Distribution } from "./types";

/**
 * Median and 90th percentile with simple-statistics' quantileSorted: the
 * ⌈n·p⌉-th smallest value, or, when n·p is a whole number, the mean of the
 * (n·p)-th and the next (so the median of an even count is the mean of the
 * middle two). Null when there is nothing to describe.
 */
export const PERCENTILE_METHOD =
  "Median and 90th percentile by simple-statistics' quantileSorted: the ⌈n·p⌉-th smallest value, or the mean of the (n·p)-th and the next when n·p is a whole number (the median of an even count is the mean of the middle two).";

export function distribution(values: readonly number[]): Distribution {
  if (values.length === 0) return { n: 0, median: null, p90: null };
  const sorted = [...values].sort((a, b) => a - b);
  return {
    n: sorted.length,
    median: round(quantileSorted(sorted, 0.5)),
    p90: round(quantileSorted(sorted, 0.9)),
  };
}

/** Rounds a reported number to 3 decimals (minutes to the millisecond are noise). */
export const round = (x: number, places = 3): number => {
  const f = 10 ** places;
  return Math.round(x * f) / f;
};

/** part / whole, or null when the whole is zero. */
export const shareOf = (part: number, whole: number): number | null =>
  whole > 0 ? round(part / whole, 4) : null;

export const MINUTE_MS = 60_000;
export const DAY_MINUTES = 1440;
export const minutes = (ms: number): number => ms / MINUTE_MS;

/** One sample of a time series: `t` in epoch milliseconds, sorted ascending. */
export type TimedPoint = { t: number };

/**
 * Thins a time-sorted series to at most `maxPoints` points for drawing,
 * without hiding a dip or a peak: the span is cut into maxPoints / 2 equal
 * time buckets and each bucket keeps its lowest and its highest sample (in
 * time order; one sample when both are the same). Every kept point is a real
 * sample, so hover details show a charted value, never an average. A series
 * already short enough is returned as it is.
 */
export function downsampleMinMax<P extends TimedPoint>(
  points: readonly P[],
  value: (point: P) => number,
  maxPoints: number,
): P[] {
  if (maxPoints < 2) throw new RangeError("maxPoints must be at least 2.");
  if (points.length <= maxPoints) return [...points];
  const first = points[0];
  const last = points[points.length - 1];
  if (!first || !last) return [];
  const buckets = Math.floor(maxPoints / 2);
  const span = Math.max(1, last.t - first.t);
  const out: P[] = [];
  let index = 0;
  for (let bucket = 0; bucket < buckets; bucket++) {
    // The last bucket is closed, so the final sample always lands in one.
    const end = bucket === buckets - 1 ? Infinity : first.t + (span * (bucket + 1)) / buckets;
    let low: P | undefined;
    let high: P | undefined;
    for (; index < points.length; index++) {
      const point = points[index];
      if (!point || point.t >= end) break;
      if (!low || value(point) < value(low)) low = point;
      if (!high || value(point) > value(high)) high = point;
    }
    if (!low || !high) continue;
    if (low === high) out.push(low);
    else if (low.t <= high.t) out.push(low, high);
    else out.push(high, low);
  }
  return out;
}

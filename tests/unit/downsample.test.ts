import { describe, expect, it } from "vitest";
import { downsampleMinMax } from "@/lib/chart/downsample";

type P = { t: number; v: number };
const series = (n: number, value: (i: number) => number): P[] =>
  Array.from({ length: n }, (_, i) => ({ t: i * 60_000, v: value(i) }));

describe("downsampleMinMax", () => {
  it("returns a short series unchanged", () => {
    const points = series(10, (i) => 90 + i);
    expect(downsampleMinMax(points, (p) => p.v, 500)).toEqual(points);
  });

  it("keeps at most maxPoints, in time order, every one a real sample", () => {
    const points = series(10_000, (i) => 90 + Math.sin(i / 7) * 5);
    const out = downsampleMinMax(points, (p) => p.v, 500);
    expect(out.length).toBeLessThanOrEqual(500);
    expect(out.length).toBeGreaterThan(250);
    for (let i = 1; i < out.length; i++) expect(out[i]!.t).toBeGreaterThan(out[i - 1]!.t);
    for (const p of out) expect(points).toContain(p);
  });

  it("keeps a single-sample dip and peak that averaging would hide", () => {
    const points = series(5_000, (i) => (i === 1234 ? 78 : i === 4321 ? 100 : 94));
    const out = downsampleMinMax(points, (p) => p.v, 100);
    expect(out.some((p) => p.v === 78 && p.t === 1234 * 60_000)).toBe(true);
    expect(out.some((p) => p.v === 100)).toBe(true);
  });

  it("keeps the first and last samples so the line spans the range", () => {
    const points = series(2_000, (i) => 90 + (i % 3));
    const out = downsampleMinMax(points, (p) => p.v, 50);
    expect(out[0]!.t).toBe(0);
    // The closed last bucket holds the final stretch of the series.
    expect(out[out.length - 1]!.t).toBeGreaterThan(1999 * 60_000 * (24 / 25));
    expect(out.length).toBeLessThanOrEqual(50);
  });

  it("refuses a bound below two points", () => {
    expect(() =>
      downsampleMinMax(
        series(5, () => 1),
        (p) => p.v,
        1,
      ),
    ).toThrow(RangeError);
  });
});

import { describe, expect, it } from "vitest";
import {
  addMeasures,
  emptyMeasures,
  fio2Timeline,
  minuteMeasures,
  MINUTE_MS,
} from "@/lib/rollups/buckets";
import { timeInBandOfSeries, type SeriesReading } from "@/lib/time-in-band";

// Invented series; the expected values are worked out by hand in the comments.

const T0 = Date.UTC(2026, 10, 2, 8, 0, 0);
const min = (m: number) => T0 + m * MINUTE_MS;
const band = (fromMin: number, toMin: number | null, lower = 92, upper = 96) => ({
  from: new Date(min(fromMin)),
  to: toMin === null ? null : new Date(min(toMin)),
  lower,
  upper,
  reassessMinutes: 60,
});
const manual = (m: number, spo2: number, fio2 = 0.4): SeriesReading => ({
  t: min(m),
  spo2,
  fio2,
  flow: null,
  source: "manual",
});

function total(map: Map<number, ReturnType<typeof emptyMeasures>>) {
  return [...map.values()].reduce(addMeasures, emptyMeasures());
}

describe("minute measures", () => {
  it("splits a held value across minutes and counts the depth below the band", () => {
    // 86 % charted at 08:00:30 holds 60 min (the order's reassessment interval) → to 09:00:30.
    const series = [{ ...manual(0, 86), t: min(0) + 30_000 }];
    const out = minuteMeasures({
      series,
      bands: [band(0, null)],
      fio2: [],
      from: min(0),
      to: min(120),
    });
    // Minutes 08:00 (30 s) … 09:00 (30 s): 61 buckets.
    expect(out.size).toBe(61);
    expect(out.get(min(0))!.belowMs).toBe(30_000);
    expect(out.get(min(1))!.belowMs).toBe(60_000);
    expect(out.get(min(60))!.belowMs).toBe(30_000);
    const sum = total(out);
    expect(sum.belowMs).toBe(3_600_000);
    expect(sum.below88Ms).toBe(3_600_000);
    expect(sum.below85Ms).toBe(0);
    // (92 − 86) % × 3600 s = 21 600 %·s.
    expect(sum.belowAreaPctS).toBeCloseTo(21_600, 6);
    expect(sum.minSpo2).toBe(86);
  });

  it("follows a band change within the period (an order superseded mid-series)", () => {
    // 90 % at 08:00 holds to 09:00. Order A 92–96 % until 08:20, order B 88–92 % after.
    const out = minuteMeasures({
      series: [manual(0, 90)],
      bands: [band(-60, 20), band(20, null, 88, 92)],
      fio2: [],
      from: min(0),
      to: min(60),
    });
    const sum = total(out);
    expect(sum.belowMs).toBe(20 * MINUTE_MS);
    expect(sum.inBandMs).toBe(40 * MINUTE_MS);
    expect(sum.belowAreaPctS).toBeCloseTo(2 * 20 * 60, 6); // 2 % for 1200 s
  });

  it("sums to the same time in band as the rules, over a random series with gaps", () => {
    let seed = 7;
    const rnd = () => (seed = (seed * 48271) % 2147483647) / 2147483647;
    const series: SeriesReading[] = [];
    let t = min(0);
    for (let i = 0; i < 3000; i++) {
      // Mostly 1 Hz monitor samples, a probe-off gap now and then, a charted value sometimes.
      t += rnd() < 0.01 ? 400_000 : 1000;
      series.push({
        t,
        spo2: 80 + Math.round(rnd() * 20),
        fio2: rnd() < 0.1 ? 0.21 : 0.4,
        flow: null,
        source: rnd() < 0.02 ? "manual" : "monitor",
      });
    }
    const bands = [band(-10, 30), band(30, 70, 88, 92), band(75, null, 94, 98)];
    const from = min(0);
    const to = min(200);
    const out = total(minuteMeasures({ series, bands, fio2: [], from, to }));
    const rules = timeInBandOfSeries({ series, bands, from, to });
    expect(out.belowMs).toBeCloseTo(rules.ms.below, 6);
    expect(out.inBandMs).toBeCloseTo(rules.ms.inBand, 6);
    expect(out.aboveMs).toBeCloseTo(rules.ms.above, 6);
    expect(rules.ms.unknown).toBeGreaterThan(0);
  });
});

describe("oxygen exposure", () => {
  it("follows the order's starting FiO2 and each adjustment, only while the series is known", () => {
    // Order from 08:00, venturi at FiO2 0.4; adjusted to 0.6 at 08:30, to 0.21 at 09:00.
    const timeline = fio2Timeline(
      [{ from: min(0), to: Infinity, device: "venturi_mask", initialFio2: 0.4, initialFlow: null }],
      [
        { at: min(30), fio2: 0.6 },
        { at: min(60), fio2: 0.21 },
      ],
    );
    expect(timeline).toEqual([
      { from: min(0), to: min(30), fio2: 0.4 },
      { from: min(30), to: min(60), fio2: 0.6 },
      { from: min(60), to: Infinity, fio2: 0.21 },
    ]);
    // A value charted at 08:10 holds 60 min, to 09:10: known 08:10–09:10.
    const sum = total(
      minuteMeasures({
        series: [manual(10, 94)],
        bands: [band(0, null)],
        fio2: timeline,
        from: min(0),
        to: min(120),
      }),
    );
    // On oxygen 08:10–09:00 = 50 min; 0.19 × 1200 s + 0.39 × 1800 s = 228 + 702 = 930 FiO2·s.
    expect(sum.o2Ms).toBe(50 * MINUTE_MS);
    expect(sum.fio2ExcessS).toBeCloseTo(930, 6);
    expect(sum.fio2HighMs).toBe(30 * MINUTE_MS);
  });

  it("starts a low-flow order at the FiO2 estimated from its flow", () => {
    const [first] = fio2Timeline(
      [{ from: min(0), to: min(60), device: "nasal_cannula", initialFio2: 0.5, initialFlow: 2 }],
      [],
    );
    // The app's own estimate (lib/devices), not the typed 0.5.
    expect(first!.fio2).toBeLessThan(0.5);
    expect(first!.fio2).toBeGreaterThan(0.21);
  });
});

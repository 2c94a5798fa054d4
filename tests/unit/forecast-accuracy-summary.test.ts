import { describe, expect, it } from "vitest";
import {
  FORECAST_ACCURACY_BASIS,
  MIN_PAIRS_FOR_INTERVAL,
  calibrationPoints,
  fio2StepBand,
  forecastAccuracyBasis,
  forecastInterval,
  pairForecasts,
  summarizeByDevice,
  summarizeByFio2Step,
  summarizePairs,
  type ForecastPair,
} from "@/lib/forecast-accuracy";
import { arterial, change, events, forecast, t } from "./forecast-accuracy-fixture";

// One admission, four checked forecasts (each gas 60 min after its change, the next change
// 120 min later), forecasts by hand as pf / a/A / shunt, shown range = their spread:
//
//   change  FiO2          device  forecast (pf/aA/shunt)  range    measured  in range
//   1       0.50 → 0.45   hfnc     80 /  85 /  90          80–90     84      yes
//   2       0.40 → 0.50   hfnc    120 / 110 / 100         100–120    95      no (below)
//   3       0.60 → 0.45   niv      60 /  70 /  75          60–75     72      yes
//   4       0.30 → 0.50   niv     150 / 130 / 125         125–150   140      yes
//
// Errors, predicted − measured:
//   pf:    80−84 = −4   120−95 = +25   60−72 = −12   150−140 = +10
//   a/A:   85−84 = +1   110−95 = +15   70−72 =  −2   130−140 = −10
//   shunt: 90−84 = +6   100−95 =  +5   75−72 =  +3   125−140 = −15
const input = events(
  [
    change(1, 0, { fromFio2: 0.5, toFio2: 0.45, device: "hfnc", forecast: forecast(80, 85, 90) }),
    change(2, 120, {
      fromFio2: 0.4,
      toFio2: 0.5,
      device: "hfnc",
      forecast: forecast(120, 110, 100),
    }),
    change(3, 240, { fromFio2: 0.6, toFio2: 0.45, device: "niv", forecast: forecast(60, 70, 75) }),
    change(4, 360, {
      fromFio2: 0.3,
      toFio2: 0.5,
      device: "niv",
      forecast: forecast(150, 130, 125),
    }),
  ],
  [arterial(11, 60, 84), arterial(12, 180, 95), arterial(13, 300, 72), arterial(14, 420, 140)],
);
const { pairs, unchecked } = pairForecasts(input);

function pairsOf(...ids: number[]): ForecastPair[] {
  return pairs.filter((p) => ids.includes(p.adjustmentId));
}

describe("summaries over pairs", () => {
  it("the fixture pairs every change with its own gas", () => {
    expect(unchecked).toEqual([]);
    expect(pairs.map((p) => [p.adjustmentId, p.gasId])).toEqual([
      [1, 11],
      [2, 12],
      [3, 13],
      [4, 14],
    ]);
  });

  it("per model: median absolute error, bias as the median error, and the mean error", () => {
    const summary = summarizePairs(pairs);
    expect(summary.n).toBe(4);
    // pf: errors sorted −12, −4, 10, 25 → median (−4 + 10)/2 = 3; mean (−4 + 25 − 12 + 10)/4 = 19/4 = 4.75
    //     |errors| sorted 4, 10, 12, 25 → median (10 + 12)/2 = 11
    expect(summary.models.pf).toMatchObject({ n: 4, medianAbsoluteError: 11, bias: 3 });
    expect(summary.models.pf.meanError).toBeCloseTo(4.75, 12);
    // a/A: errors sorted −10, −2, 1, 15 → median (−2 + 1)/2 = −0.5; mean (1 + 15 − 2 − 10)/4 = 1
    //      |errors| sorted 1, 2, 10, 15 → median (2 + 10)/2 = 6
    expect(summary.models.alveolarArterialRatio).toMatchObject({
      n: 4,
      medianAbsoluteError: 6,
      bias: -0.5,
    });
    expect(summary.models.alveolarArterialRatio.meanError).toBeCloseTo(1, 12);
    // shunt: errors sorted −15, 3, 5, 6 → median (3 + 5)/2 = 4; mean (6 + 5 + 3 − 15)/4 = −0.25
    //        |errors| sorted 3, 5, 6, 15 → median (5 + 6)/2 = 5.5
    expect(summary.models.shunt).toMatchObject({ n: 4, medianAbsoluteError: 5.5, bias: 4 });
    expect(summary.models.shunt.meanError).toBeCloseTo(-0.25, 12);
  });

  it("coverage of the shown range, with the pairs below and above it", () => {
    // In range: changes 1, 3, 4; change 2 measured 95 below its range 100–120 → 3/4.
    expect(summarizePairs(pairs).coverage).toEqual({
      n: 4,
      inRange: 3,
      below: 1,
      above: 0,
      share: 0.75,
    });
  });

  it("names the closest model: lowest median absolute error (shunt 5.5 < a/A 6 < pf 11)", () => {
    expect(summarizePairs(pairs).closest).toEqual({ models: ["shunt"], medianAbsoluteError: 5.5 });
  });

  it("names every model at a tie", () => {
    // pf 90, a/A 110, shunt 120 against 100: |errors| 10, 10, 20 → pf and a/A tie at 10.
    const tie = pairForecasts(
      events([change(1, 0, { forecast: forecast(90, 110, 120) })], [arterial(5, 60, 100)]),
    ).pairs;
    expect(summarizePairs(tie).closest).toEqual({
      models: ["pf", "alveolarArterialRatio"],
      medianAbsoluteError: 10,
    });
  });

  it("says nothing rather than zero without pairs", () => {
    const empty = summarizePairs([]);
    expect(empty.n).toBe(0);
    expect(empty.models.pf).toMatchObject({
      medianAbsoluteError: null,
      bias: null,
      meanError: null,
    });
    expect(empty.coverage.share).toBeNull();
    expect(empty.closest).toBeNull();
  });

  it("groups by device", () => {
    const byDevice = summarizeByDevice(pairs);
    expect(byDevice.map((g) => [g.device, g.summary.n])).toEqual([
      ["hfnc", 2],
      ["niv", 2],
    ]);
    // hfnc pf errors −4, +25 → median 10.5; niv pf errors −12, +10 → median −1
    expect(byDevice[0]?.summary.models.pf.bias).toBe(10.5);
    expect(byDevice[1]?.summary.models.pf.bias).toBe(-1);
    // niv: both in range → coverage 1; hfnc: 1 of 2 → 0.5
    expect(byDevice.map((g) => g.summary.coverage.share)).toEqual([0.5, 1]);
  });

  it("bands FiO2 steps by size, with the bounds inclusive despite floating point", () => {
    // 0.45 − 0.50 is −0.04999… and 0.45 − 0.60 is −0.15000…02 in floating point; both are
    // rounded to the stored precision first, so they land in "up to 0.05" and "up to 0.15".
    expect(pairs.map((p) => p.fio2Step)).toEqual([-0.05, 0.1, -0.15, 0.2]);
    expect(fio2StepBand(-0.05)).toBe("small");
    expect(fio2StepBand(0)).toBe("small");
    expect(fio2StepBand(0.06)).toBe("medium");
    expect(fio2StepBand(-0.15)).toBe("medium");
    expect(fio2StepBand(0.16)).toBe("large");
    const byStep = summarizeByFio2Step(pairs);
    // small: change 1; medium: changes 2 and 3; large: change 4.
    expect(byStep.map((g) => [g.band, g.summary.n])).toEqual([
      ["small", 1],
      ["medium", 2],
      ["large", 1],
    ]);
    // medium pf |errors| 25, 12 → median 18.5
    expect(byStep[1]?.summary.models.pf.medianAbsoluteError).toBe(18.5);
    expect(byStep[2]?.label).toBe("FiO2 step over 0.15");
  });

  it("keeps every step band when a band is empty", () => {
    expect(summarizeByFio2Step(pairsOf(4)).map((g) => [g.band, g.summary.n])).toEqual([
      ["small", 0],
      ["medium", 0],
      ["large", 1],
    ]);
  });

  it("gives calibration points, predicted against measured, per model", () => {
    const points = calibrationPoints(pairsOf(1, 2));
    expect(points).toEqual([
      { model: "pf", adjustmentId: 1, gasId: 11, predicted: 80, measured: 84 },
      { model: "pf", adjustmentId: 2, gasId: 12, predicted: 120, measured: 95 },
      { model: "alveolarArterialRatio", adjustmentId: 1, gasId: 11, predicted: 85, measured: 84 },
      { model: "alveolarArterialRatio", adjustmentId: 2, gasId: 12, predicted: 110, measured: 95 },
      { model: "shunt", adjustmentId: 1, gasId: 11, predicted: 90, measured: 84 },
      { model: "shunt", adjustmentId: 2, gasId: 12, predicted: 100, measured: 95 },
    ]);
  });
});

describe("the empirical interval", () => {
  // The next forecast: pf 100, a/A 105, shunt 110; shown range 100–110.
  const next = forecast(100, 105, 110);

  it("widens the range to the patient's errors once there are 4 pairs", () => {
    // Each model: P − (largest error) … P − (smallest error).
    //   pf:    errors −12 … +25 → 100 − 25 = 75  … 100 + 12 = 112
    //   a/A:   errors −10 … +15 → 105 − 15 = 90  … 105 + 10 = 115
    //   shunt: errors −15 … +6  → 110 − 6  = 104 … 110 + 15 = 125
    // Union with the shown 100–110: 75 … 125.
    const interval = forecastInterval(next, pairs);
    expect(interval.kind).toBe("empirical");
    if (interval.kind !== "empirical") return;
    expect(interval.label).toBe("empirical interval (4 pairs)");
    expect(interval.n).toBe(4);
    expect(interval.low.pao2).toBe(75);
    expect(interval.high.pao2).toBe(125);
    expect(interval.shown).toEqual({ low: 100, high: 110 });
    expect(interval.models.pf).toEqual({
      model: "pf",
      predicted: 100,
      minError: -12,
      maxError: 25,
      low: 75,
      high: 112,
    });
    expect([
      interval.models.alveolarArterialRatio.low,
      interval.models.alveolarArterialRatio.high,
    ]).toEqual([90, 115]);
    expect([interval.models.shunt.low, interval.models.shunt.high]).toEqual([104, 125]);
    // (n − 1)/(n + 1) = 3/5
    expect(interval.nominalCoverage).toBeCloseTo(0.6, 12);
    // Severinghaus at 125 mmHg: 125³ + 150·125 = 1,971,875; 23400/1,971,875 = 0.011867;
    // 1/1.011867 = 0.98827 → 98.83 %. At 75 mmHg: 421,875 + 11,250 = 433,125;
    // 23400/433,125 = 0.054026; 1/1.054026 = 0.94874 → 94.87 %.
    expect(interval.high.spo2).toBeCloseTo(98.83, 2);
    expect(interval.low.spo2).toBeCloseTo(94.87, 2);
    expect(interval.basis).toContain("P − (largest error)");
  });

  it("at exactly 3 pairs uses those 3 only", () => {
    // Pairs 1–3 (asOf: gas 13's time, 300 min):
    //   pf errors −4, +25, −12 → 75 … 112;  a/A +1, +15, −2 → 105 − 15 = 90 … 105 + 2 = 107;
    //   shunt +6, +5, +3 → 110 − 6 = 104 … 110 − 3 = 107. Union with 100–110: 75 … 112.
    expect(MIN_PAIRS_FOR_INTERVAL).toBe(3);
    const interval = forecastInterval(next, pairs, { asOf: t(300) });
    expect(interval).toMatchObject({
      kind: "empirical",
      n: 3,
      label: "empirical interval (3 pairs)",
    });
    expect([interval.low.pao2, interval.high.pao2]).toEqual([75, 112]);
    if (interval.kind === "empirical") {
      expect(interval.models.shunt).toMatchObject({ low: 104, high: 107 });
      expect(interval.nominalCoverage).toBeCloseTo(0.5, 12); // 2/4
    }
  });

  it("below 3 pairs keeps the shown range and says why", () => {
    // asOf 299 min: gas 13 (300 min) is not known yet → 2 pairs.
    const interval = forecastInterval(next, pairs, { asOf: t(299) });
    expect(interval.kind).toBe("shown");
    expect(interval.n).toBe(2);
    expect([interval.low.pao2, interval.high.pao2]).toEqual([100, 110]);
    expect(interval.label).toBe("forecast range (spread of the three models)");
    if (interval.kind === "shown") {
      expect(interval.reason).toContain("2 checked forecasts");
      expect(interval.reason).toContain("at least 3");
    }
    const none = forecastInterval(next, []);
    expect(none.kind === "shown" && none.reason.startsWith("No checked forecasts")).toBe(true);
  });

  it("is never narrower than the shown range, even when every past error has one sign", () => {
    // Three changes, each forecast 100 / 100 / 100, measured 90, 80, 95: every model's
    // errors are +10, +20, +5 (always too high). For 100 / 105 / 110:
    //   pf 100 − 20 = 80 … 100 − 5 = 95; a/A 85 … 100; shunt 90 … 105 → models alone 80 … 105,
    //   but the shown 100–110 stays inside: 80 … 110.
    const measuredAs = (a: number, b: number, c: number) =>
      pairForecasts(
        events(
          [
            change(1, 0, { forecast: forecast(100, 100, 100) }),
            change(2, 120, { forecast: forecast(100, 100, 100) }),
            change(3, 240, { forecast: forecast(100, 100, 100) }),
          ],
          [arterial(11, 60, a), arterial(12, 180, b), arterial(13, 300, c)],
        ),
      ).pairs;
    const tooHigh = forecastInterval(next, measuredAs(90, 80, 95));
    expect(tooHigh.kind).toBe("empirical");
    expect(tooHigh.kind === "empirical" && tooHigh.models.shunt.high).toBe(105);
    expect([tooHigh.low.pao2, tooHigh.high.pao2]).toEqual([80, 110]);
    // Measured 110, 120, 105: errors −10, −20, −5 (always too low).
    //   pf 100 + 5 = 105 … 100 + 20 = 120; a/A 110 … 125; shunt 115 … 130 → models alone
    //   105 … 130; with the shown 100–110: 100 … 130.
    const tooLow = forecastInterval(next, measuredAs(110, 120, 105));
    expect(tooLow.kind === "empirical" && tooLow.models.pf.low).toBe(105);
    expect([tooLow.low.pao2, tooLow.high.pao2]).toEqual([100, 130]);
  });

  it("never widens below 0 mmHg", () => {
    // pf 20 with the largest pf error +25: 20 − 25 = −5 → the interval starts at 0.
    const interval = forecastInterval(forecast(20, 30, 40), pairs);
    expect(interval.low.pao2).toBe(0);
    expect(interval.kind === "empirical" && interval.models.pf.low).toBe(-5);
  });
});

describe("the basis catalogue", () => {
  it("names Karbing 2007 for P/F drift and Gilbert & Keighley 1974 for a/A", () => {
    const byKey = new Map(FORECAST_ACCURACY_BASIS.map((b) => [b.key, b]));
    expect(byKey.get("modelPf")?.source).toContain("Crit Care 2007;11:R118");
    expect(byKey.get("modelPf")?.source).toContain("10.1186/cc6174");
    expect(byKey.get("fio2StepBand")?.source).toContain("Karbing");
    expect(byKey.get("modelAlveolarArterialRatio")?.source).toContain("Gilbert R, Keighley JF");
    expect(byKey.get("modelAlveolarArterialRatio")?.source).toContain("Am Rev Respir Dis 1974");
  });

  it("gives every entry a definition and a source that is published, common practice or assumed", () => {
    const keys = FORECAST_ACCURACY_BASIS.map((b) => b.key);
    expect(new Set(keys).size).toBe(keys.length);
    for (const key of [
      "pairing",
      "unchecked",
      "error",
      "medianAbsoluteError",
      "bias",
      "coverage",
      "closest",
      "fio2StepBand",
      "calibration",
      "empiricalInterval",
    ]) {
      expect(keys).toContain(key);
    }
    for (const entry of FORECAST_ACCURACY_BASIS) {
      expect(entry.definition.length).toBeGreaterThan(20);
      expect(entry.source).toMatch(/Karbing|Gilbert|Berggren|Horovitz|common practice|assumed/i);
    }
  });

  it("states the window it was made with", () => {
    const pairing = forecastAccuracyBasis({ minMinutes: 15, maxMinutes: 180 }).find(
      (b) => b.key === "pairing",
    );
    expect(pairing?.definition).toContain("15–180 min");
    expect(FORECAST_ACCURACY_BASIS.find((b) => b.key === "pairing")?.definition).toContain(
      "20–240 min",
    );
  });
});

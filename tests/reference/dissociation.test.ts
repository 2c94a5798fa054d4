import { describe, expect, it } from "vitest";
import { po2FromSaturation, saturationFromPO2 } from "@/lib/oxygen";

// Severinghaus JW. J Appl Physiol 1979;46:599–602: the published equation,
// written out again here so the engine is checked against the paper, not itself.
const severinghaus1979 = (po2: number) => 1 / (23400 / (po2 ** 3 + 150 * po2) + 1);

// Ellis RK. J Appl Physiol 1989;67:902: the published Cardano form of the inverse.
const ellis1989 = (so2: number) => {
  const a = 11700 / (1 / so2 - 1);
  const b = Math.sqrt(50 ** 3 + a ** 2);
  return Math.cbrt(b + a) - Math.cbrt(b - a);
};

describe("saturationFromPO2 — Severinghaus 1979", () => {
  it.each([1, 10, 26.8, 40, 60, 80, 100, 150, 300, 600, 800])(
    "follows the published equation at PO2 %s mmHg",
    (po2) => {
      expect(saturationFromPO2(po2)).toBeCloseTo(severinghaus1979(po2), 12);
    },
  );

  // Standard-curve anchor points (37 °C, pH 7.40), Severinghaus 1979 table,
  // recalled from memory; tolerance ±1 % saturation, the equation's stated fit
  // to the table being within about 0.5 %.
  it.each([
    [26.8, 0.5],
    [40, 0.75],
    [60, 0.905],
    [100, 0.975],
  ])("reproduces the standard curve: PO2 %s mmHg → SO2 %s (±0.01)", (po2, so2) => {
    expect(Math.abs(saturationFromPO2(po2) - so2)).toBeLessThanOrEqual(0.01);
  });

  it("puts P50 at 26.8 mmHg, the standard adult P50 (Severinghaus 1979)", () => {
    expect(saturationFromPO2(26.8)).toBeGreaterThan(0.49);
    expect(saturationFromPO2(26.8)).toBeLessThan(0.51);
  });

  it("is nearly flat above 100 mmHg and steep between 20 and 60 mmHg (shape of the standard curve, common practice)", () => {
    const flat = saturationFromPO2(200) - saturationFromPO2(100);
    const steep = saturationFromPO2(60) - saturationFromPO2(20);
    expect(flat).toBeLessThan(0.03);
    expect(steep).toBeGreaterThan(0.5);
  });
});

describe("po2FromSaturation — Ellis 1989 inverse", () => {
  it.each([0.001, 0.05, 0.3, 0.5, 0.75, 0.9, 0.97, 0.99, 0.9999])(
    "matches the published Cardano form at SO2 %s",
    (so2) => {
      const expected = ellis1989(so2);
      expect(Math.abs(po2FromSaturation(so2) - expected)).toBeLessThanOrEqual(
        1e-9 * expected + 1e-9,
      );
    },
  );

  it.each([0.1, 0.5, 0.9, 0.99])(
    "solves the Severinghaus cubic PO2³ + 150·PO2 = 23400·S/(1 − S) at SO2 %s",
    (so2) => {
      const po2 = po2FromSaturation(so2);
      const rightSide = (23400 * so2) / (1 - so2);
      expect(Math.abs(po2 ** 3 + 150 * po2 - rightSide) / rightSide).toBeLessThan(1e-12);
    },
  );

  // Severinghaus 1979 also published an approximate empirical inverse,
  // PO2 = exp(0.385·ln((1/S − 1)⁻¹) + 3.32 − (72·S)⁻¹ − S⁶/6) — recalled from
  // memory. The exact inverse must agree with it within 1 mmHg between 30 and 97 %.
  it.each([0.3, 0.5, 0.75, 0.9, 0.97])(
    "agrees within 1 mmHg with Severinghaus's approximate inverse at SO2 %s",
    (so2) => {
      const approximate = Math.exp(
        0.385 * Math.log(1 / (1 / so2 - 1)) + 3.32 - 1 / (72 * so2) - so2 ** 6 / 6,
      );
      expect(Math.abs(po2FromSaturation(so2) - approximate)).toBeLessThan(1);
    },
  );

  it("gives about 60 mmHg at 90 % and 40 mmHg at 75 % (bedside anchors, common practice)", () => {
    expect(po2FromSaturation(0.9)).toBeGreaterThan(57);
    expect(po2FromSaturation(0.9)).toBeLessThan(61);
    expect(po2FromSaturation(0.75)).toBeGreaterThan(39);
    expect(po2FromSaturation(0.75)).toBeLessThan(41);
  });
});

import { describe, expect, it } from "vitest";
import {
  imputePfFromSf,
  OxygenChoiceError,
  OxygenInputError,
  type PfImputation,
  type PfImputationMethod,
} from "@/lib/oxygen";

// Expected values are worked out by hand from the published equations (the
// arithmetic beside each); the non-linear method is checked against the
// Severinghaus equation written out again here, not against the engine.

// Severinghaus JW. J Appl Physiol 1979;46:599–602.
const severinghaus1979 = (po2: number) => 1 / (23400 / (po2 ** 3 + 150 * po2) + 1);

function imputed(spo2: number, fio2: number, method: PfImputationMethod) {
  const result = imputePfFromSf({ spo2, fio2, method });
  if (!result.valid) throw new Error(`expected a valid imputation, got: ${result.reason}`);
  return result;
}

function refused(spo2: number, fio2: number, method: PfImputationMethod) {
  const result: PfImputation = imputePfFromSf({ spo2, fio2, method });
  if (result.valid) throw new Error(`expected no imputation, got P/F ${result.pf}`);
  return result;
}

describe("imputePfFromSf, linear — S/F = 64 + 0.84 × P/F (Rice et al., Chest 2007)", () => {
  it("maps S/F 235 to P/F 203.6, the S/F the paper pairs with P/F 200", () => {
    // SpO2 94 / FiO2 0.4 = 235; (235 − 64) / 0.84 = 171 / 0.84 = 203.571
    const result = imputed(94, 0.4, "linear");
    expect(result.sf).toBe(235);
    expect(result.pf).toBeCloseTo(203.571, 3);
    // The paper's reported pair (235 ↔ 200) and its regression agree within 4 mmHg.
    expect(Math.abs(result.pf - 200)).toBeLessThan(4);
    // PaO2 implied at FiO2 0.4: 203.571 × 0.4 = 81.43
    expect(result.pao2).toBeCloseTo(81.429, 3);
  });

  it("maps S/F 315 to P/F 298.8, the S/F the paper pairs with P/F 300", () => {
    // SpO2 94.5 / FiO2 0.3 = 315; (315 − 64) / 0.84 = 251 / 0.84 = 298.810
    const result = imputed(94.5, 0.3, "linear");
    expect(result.pf).toBeCloseTo(298.81, 2);
    expect(Math.abs(result.pf - 300)).toBeLessThan(4);
  });

  it("inverts the published regression: P/F 200 and 300 come from S/F 232 and 316 (64 + 168, 64 + 252)", () => {
    // S/F 232 = SpO2 92.8 on FiO2 0.4; S/F 316 = SpO2 94.8 on FiO2 0.3
    expect(imputed(92.8, 0.4, "linear").pf).toBeCloseTo(200, 10);
    expect(imputed(94.8, 0.3, "linear").pf).toBeCloseTo(300, 10);
  });

  it("imputes up to SpO2 97 % and refuses above it in words, the range the regression was derived from (Rice 2007: SpO2 ≤ 97 %)", () => {
    // 97 / 0.5 = 194; (194 − 64) / 0.84 = 154.762
    expect(imputed(97, 0.5, "linear").pf).toBeCloseTo(154.762, 3);
    const above = refused(97.1, 0.5, "linear");
    expect(above.pf).toBeNull();
    expect(above.reason).toMatch(/above 97 %/);
  });

  it("refuses S/F at or below the intercept 64 and an implied PaO2 below 10 mmHg (physical range, engine contract)", () => {
    // 60 / 1 = 60 ≤ 64: no positive P/F
    expect(refused(60, 1, "linear").reason).toMatch(/intercept/);
    // 72 / 1 = 72; (72 − 64) / 0.84 = 9.524 mmHg × FiO2 1 = 9.5 mmHg PaO2 < 10
    expect(refused(72, 1, "linear").reason).toMatch(/below any live arterial value/);
    // 73 / 1 = 73; (73 − 64) / 0.84 = 10.714 ≥ 10
    expect(imputed(73, 1, "linear").pf).toBeCloseTo(10.714, 3);
  });
});

describe("imputePfFromSf, non-linear — PaO2 from SpO2 on the Severinghaus curve (Brown et al., Chest 2016; Ellis 1989)", () => {
  it("gives a PaO2 whose Severinghaus saturation is the SpO2 given, divided by FiO2", () => {
    for (const [spo2, fio2] of [
      [90, 0.5],
      [85, 0.8],
      [94, 0.3],
    ] as const) {
      const result = imputed(spo2, fio2, "nonlinear");
      expect(result.pao2 / fio2).toBeCloseTo(result.pf, 10);
      expect(severinghaus1979(result.pao2)).toBeCloseTo(spo2 / 100, 10);
    }
  });

  it("puts SpO2 90 % near PaO2 60 mmHg (common practice): P/F about 117 on FiO2 0.5", () => {
    const result = imputed(90, 0.5, "nonlinear");
    expect(result.pao2).toBeGreaterThan(57);
    expect(result.pao2).toBeLessThan(61);
    expect(result.pf).toBeGreaterThan(114);
    expect(result.pf).toBeLessThan(122);
  });

  it("imputes up to SpO2 96 % and refuses above it in words (Brown 2016: SpO2 ≤ 96 %)", () => {
    // S at PaO2 81.9 mmHg = 1 / (23400 / (81.9³ + 150 × 81.9) + 1) ≈ 0.960
    expect(imputed(96, 0.4, "nonlinear").pao2).toBeCloseTo(81.9, 1);
    const above = refused(96.1, 0.4, "nonlinear");
    expect(above.pf).toBeNull();
    expect(above.reason).toMatch(/above 96 %.*too flat/);
  });

  it("reads lower than the linear equation in hypoxaemia: SpO2 88 % on FiO2 0.6 (Brown 2016 found the non-linear one closer to the measured P/F for SpO2 ≤ 96 %)", () => {
    // linear: 88 / 0.6 = 146.667; (146.667 − 64) / 0.84 = 98.413
    // non-linear: S(54) = 1 / (23400 / (157464 + 8100) + 1) = 0.8762 and
    // S(56) = 1 / (23400 / (175616 + 8400) + 1) = 0.8872, so PaO2 lies between 54 and 56 mmHg, P/F 90–93
    expect(imputed(88, 0.6, "linear").pf).toBeCloseTo(98.413, 3);
    const nonlinear = imputed(88, 0.6, "nonlinear");
    expect(nonlinear.pao2).toBeGreaterThan(54);
    expect(nonlinear.pao2).toBeLessThan(56);
    expect(nonlinear.pf).toBeLessThan(98.413);
  });
});

describe("imputePfFromSf refuses impossible input (engine contract)", () => {
  it.each(["linear", "nonlinear"] as const)(
    "%s: SpO2 outside 40–100 %, FiO2 outside 0.21–1",
    (method) => {
      expect(() => imputePfFromSf({ spo2: 39.9, fio2: 0.5, method })).toThrow(OxygenInputError);
      expect(() => imputePfFromSf({ spo2: 0.92, fio2: 0.5, method })).toThrow(OxygenInputError);
      expect(() => imputePfFromSf({ spo2: 92, fio2: 50, method })).toThrow(OxygenInputError);
      expect(() => imputePfFromSf({ spo2: Number.NaN, fio2: 0.5, method })).toThrow(
        OxygenInputError,
      );
    },
  );

  it("refuses a method it does not know", () => {
    expect(() =>
      imputePfFromSf({ spo2: 92, fio2: 0.5, method: "log-linear" as PfImputationMethod }),
    ).toThrow(OxygenChoiceError);
  });

  it("marks an SpO2 below oximeter accuracy (70 %) in the caveats but still imputes", () => {
    const result = imputed(65, 0.6, "nonlinear");
    expect(result.caveats.some((caveat) => caveat.includes("below oximeter accuracy"))).toBe(true);
  });
});

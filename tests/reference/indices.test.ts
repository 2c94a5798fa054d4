import { describe, expect, it } from "vitest";
import {
  assessBloodGas,
  classifyOxygenation,
  expectedAaGradient,
  oxygenationIndex,
  oxygenContent,
  oxygenContentParts,
  oxygenDelivery,
  OxygenInputError,
  oxygenSaturationIndex,
  pfRatio,
  roxIndex,
  sfRatio,
} from "@/lib/oxygen";

// Every expected value below is worked out by hand from the published formula
// (the arithmetic is in the comment beside it) and typed in as a number; none
// is computed by the engine or by re-typing the engine's expression.

// Input bounds: the engine's own contract (lib/oxygen/ranges.ts: "inclusive at
// both ends"), not a published value. Each function is called exactly on its
// bounds (accepted) and just outside them (refused), so turning a `<` into a
// `<=` in the range check, or narrowing a bound, fails here.

describe("pfRatio — PaO2/FiO2 (Horovitz, Carrico, Shires, Arch Surg 1974)", () => {
  it("is 476 mmHg for PaO2 100 mmHg on room air, inside the normal 400–500 (common practice)", () => {
    // 100 / 0.21 = 476.19
    const value = pfRatio(100, 0.21);
    expect(value).toBeCloseTo(476.19, 2);
    expect(value).toBeGreaterThanOrEqual(400);
    expect(value).toBeLessThanOrEqual(500);
  });

  it("is exactly 200 at PaO2 100 on FiO2 0.5, the Berlin mild/moderate edge (ARDS Definition Task Force, JAMA 2012)", () => {
    // 100 / 0.5 = 200; Berlin: moderate 100 < P/F ≤ 200, so 200 is moderate.
    expect(pfRatio(100, 0.5)).toBe(200);
    expect(
      classifyOxygenation({ pao2: 100, fio2: 0.5, peep: 8, support: "invasive" }).berlin.category,
    ).toBe("moderate");
  });

  it("accepts PaO2 10–700 mmHg and FiO2 0.21–1 inclusive, and refuses just outside (engine contract)", () => {
    // 10 / 0.21 = 47.62; 700 / 1 = 700
    expect(pfRatio(10, 0.21)).toBeCloseTo(47.62, 2);
    expect(pfRatio(700, 1)).toBe(700);
    expect(() => pfRatio(9.9, 0.5)).toThrow(OxygenInputError);
    expect(() => pfRatio(700.1, 0.5)).toThrow(OxygenInputError);
    expect(() => pfRatio(80, 0.2)).toThrow(OxygenInputError);
    // FiO2 typed as a percentage is the error the bound exists for.
    expect(() => pfRatio(80, 40)).toThrow(OxygenInputError);
  });
});

describe("sfRatio — SpO2 (%)/FiO2 (Rice et al., Chest 2007)", () => {
  // Rice 2007 published S/F 235 as corresponding to P/F 200 and S/F 315 to
  // P/F 300; the 2023 global definition (Matthay et al., AJRCCM 2024) adopts
  // them as its S/F band edges beside the P/F edges 200 and 300.
  it("gives S/F 235 for SpO2 94 % on FiO2 0.4, the value Rice 2007 pairs with P/F 200", () => {
    // 94 / 0.4 = 235; 80 / 0.4 = 200
    expect(sfRatio(94, 0.4)).toBe(235);
    expect(pfRatio(80, 0.4)).toBe(200);
    // The pair sits on the same edge: both moderate (148 < S/F ≤ 235, 100 < P/F ≤ 200) when intubated.
    const global = (input: { pao2?: number; spo2?: number; fio2: number }) =>
      classifyOxygenation({ ...input, peep: 8, support: "invasive" }).global.category;
    expect(global({ spo2: 94, fio2: 0.4 })).toBe("moderate");
    expect(global({ pao2: 80, fio2: 0.4 })).toBe("moderate");
  });

  it("gives S/F 315 for SpO2 94.5 % on FiO2 0.3, the value Rice 2007 pairs with P/F 300", () => {
    // 94.5 / 0.3 = 315; 90 / 0.3 = 300
    expect(sfRatio(94.5, 0.3)).toBe(315);
    expect(pfRatio(90, 0.3)).toBe(300);
    const global = (input: { pao2?: number; spo2?: number; fio2: number }) =>
      classifyOxygenation({ ...input, peep: 8, support: "invasive" }).global.category;
    // Both on the mild side of their edge (235 < S/F ≤ 315, 200 < P/F ≤ 300) …
    expect(global({ spo2: 94.5, fio2: 0.3 })).toBe("mild");
    expect(global({ pao2: 90, fio2: 0.3 })).toBe("mild");
    // … and both out of it one step above: 94.8 / 0.3 = 316, 90.3 / 0.3 = 301.
    expect(global({ spo2: 94.8, fio2: 0.3 })).toBe("none");
    expect(global({ pao2: 90.3, fio2: 0.3 })).toBe("none");
  });

  it("accepts SpO2 40–100 % inclusive and refuses just outside (engine contract)", () => {
    // 40 / 1 = 40; 100 / 0.21 = 476.19
    expect(sfRatio(40, 1)).toBe(40);
    expect(sfRatio(100, 0.21)).toBeCloseTo(476.19, 2);
    expect(() => sfRatio(39.9, 0.5)).toThrow(OxygenInputError);
    expect(() => sfRatio(100.1, 0.5)).toThrow(OxygenInputError);
    // SpO2 typed as a fraction.
    expect(() => sfRatio(0.94, 0.4)).toThrow(OxygenInputError);
  });

  it("says S/F is not interpretable above SpO2 97 % but not at 97 % (Matthay et al., AJRCCM 2024)", () => {
    const caveat = (spo2: number) =>
      assessBloodGas({ fio2: 0.4, pao2: 110, paco2: 40, spo2 }).caveats.some((c) =>
        c.includes("S/F ratio is not interpretable"),
      );
    expect(caveat(97)).toBe(false);
    expect(caveat(97.1)).toBe(true);
  });
});

describe("SpO2 against PaO2 on the standard curve (Severinghaus, J Appl Physiol 1979)", () => {
  it("warns when SpO2 is more than 4 points from the curve's value, not at 3.9", () => {
    // S at PaO2 60 = 1 / (23400 / (60³ + 150 × 60) + 1) = 1 / (23400 / 225000 + 1) = 1 / 1.104 = 90.58 %
    // SpO2 94.48 is 3.90 above it (no caveat), 94.68 is 4.10 above (caveat); 86.48 is 4.10 below.
    const differs = (spo2: number) =>
      assessBloodGas({ fio2: 0.4, pao2: 60, paco2: 40, spo2 }).caveats.some((c) =>
        c.includes("differs from the 91 %"),
      );
    expect(differs(94.48)).toBe(false);
    expect(differs(94.68)).toBe(true);
    expect(differs(86.48)).toBe(true);
  });
});

describe("roxIndex — (SpO2 %/FiO2)/RR (Roca et al., AJRCCM 2019)", () => {
  // Roca 2019, on HFNC: ROX ≥ 4.88 at 2, 6 or 12 h → lower risk of intubation;
  // HFNC failure predicted by < 2.85 at 2 h, < 3.47 at 6 h, < 3.85 at 12 h.
  it("is 7.36 for SpO2 92 % on FiO2 0.5 at RR 25: above 4.88, the lower-risk side", () => {
    // (92 / 0.5) / 25 = 184 / 25 = 7.36
    const value = roxIndex({ spo2: 92, fio2: 0.5, respiratoryRate: 25 });
    expect(value).toBeCloseTo(7.36, 10);
    expect(value).toBeGreaterThanOrEqual(4.88);
  });

  it("is 3.14 for SpO2 88 % on FiO2 0.8 at RR 35: below the 6 h (3.47) and 12 h (3.85) failure thresholds, above the 2 h one (2.85)", () => {
    // (88 / 0.8) / 35 = 110 / 35 = 3.1429
    const value = roxIndex({ spo2: 88, fio2: 0.8, respiratoryRate: 35 });
    expect(value).toBeCloseTo(3.1429, 4);
    expect(value).toBeLessThan(3.47);
    expect(value).toBeLessThan(3.85);
    expect(value).toBeGreaterThanOrEqual(2.85);
  });

  it("moves across 4.88 with one breath per minute: SpO2 90 % on FiO2 0.5 at RR 36 vs 37", () => {
    // 180 / 36 = 5.000 (≥ 4.88); 180 / 37 = 4.8649 (< 4.88)
    expect(roxIndex({ spo2: 90, fio2: 0.5, respiratoryRate: 36 })).toBeCloseTo(5, 10);
    expect(roxIndex({ spo2: 90, fio2: 0.5, respiratoryRate: 37 })).toBeCloseTo(4.8649, 4);
  });

  it("keeps the two cases checked before: 3.93 (below 4.88) and 12 (above)", () => {
    // (88 / 0.7) / 32 = 125.714 / 32 = 3.9286; (96 / 0.4) / 20 = 240 / 20 = 12;
    // (92 / 0.6) / 30 = 153.333 / 30 = 5.1111
    expect(roxIndex({ spo2: 88, fio2: 0.7, respiratoryRate: 32 })).toBeCloseTo(3.9286, 4);
    expect(roxIndex({ spo2: 96, fio2: 0.4, respiratoryRate: 20 })).toBeCloseTo(12, 10);
    expect(roxIndex({ spo2: 92, fio2: 0.6, respiratoryRate: 30 })).toBeCloseTo(5.1111, 4);
  });

  it("accepts RR 2–80 /min inclusive and refuses just outside (engine contract)", () => {
    // 200 / 2 = 100; 200 / 80 = 2.5 (SpO2 100 on FiO2 0.5: S/F 200)
    expect(roxIndex({ spo2: 100, fio2: 0.5, respiratoryRate: 2 })).toBe(100);
    expect(roxIndex({ spo2: 100, fio2: 0.5, respiratoryRate: 80 })).toBe(2.5);
    expect(() => roxIndex({ spo2: 100, fio2: 0.5, respiratoryRate: 1.9 })).toThrow(
      OxygenInputError,
    );
    expect(() => roxIndex({ spo2: 100, fio2: 0.5, respiratoryRate: 80.5 })).toThrow(
      OxygenInputError,
    );
    // SpO2 and FiO2 are checked through S/F.
    expect(() => roxIndex({ spo2: 39, fio2: 0.5, respiratoryRate: 20 })).toThrow(OxygenInputError);
  });
});

// PALICC, Pediatr Crit Care Med 2015;16:428, invasively ventilated: OI mild 4 to < 8,
// moderate 8 to < 16, severe ≥ 16; OSI mild 5 to < 7.5, moderate 7.5 to < 12.3,
// severe ≥ 12.3. Both take FiO2 as a percentage. The bands are the test's
// own, typed from the consensus; the engine only computes the indices.
const palicc = (value: number, [moderate, severe]: readonly [number, number]) =>
  value >= severe ? "severe" : value >= moderate ? "moderate" : "mild";
const OI_BANDS = [8, 16] as const;
const OSI_BANDS = [7.5, 12.3] as const;

describe("oxygenationIndex — FiO2 (%) × MAP / PaO2 (PALICC 2015)", () => {
  it.each([
    // FiO2, MAP, PaO2, hand value, PALICC band
    [0.4, 12, 80, 6, "mild"], // 40 × 12 / 80 = 6
    [0.6, 15, 60, 15, "moderate"], // 60 × 15 / 60 = 15
    [1, 20, 60, 33.3333, "severe"], // 100 × 20 / 60 = 33.33
    [0.4, 20, 100, 8, "moderate"], // 40 × 20 / 100 = 8, the mild/moderate edge
    [0.8, 20, 100, 16, "severe"], // 80 × 20 / 100 = 16, the moderate/severe edge
  ] as const)("FiO2 %s, MAP %s cmH2O, PaO2 %s mmHg → OI %s (%s)", (fio2, map, pao2, oi, band) => {
    const value = oxygenationIndex({ fio2, meanAirwayPressure: map, pao2 });
    expect(value).toBeCloseTo(oi, 4);
    expect(palicc(value, OI_BANDS)).toBe(band);
  });

  it("takes FiO2 as a percentage: a fraction would give 0.15, not 15 (PALICC 2015)", () => {
    // 0.6 × 15 / 60 would be 0.15, below every PALICC band; as published it is 15.
    expect(oxygenationIndex({ fio2: 0.6, meanAirwayPressure: 15, pao2: 60 })).toBeGreaterThan(14);
  });

  it("accepts MAP 1–60 cmH2O inclusive and refuses just outside (engine contract)", () => {
    // 100 × 1 / 100 = 1; 100 × 60 / 100 = 60
    expect(oxygenationIndex({ fio2: 1, meanAirwayPressure: 1, pao2: 100 })).toBeCloseTo(1, 10);
    expect(oxygenationIndex({ fio2: 1, meanAirwayPressure: 60, pao2: 100 })).toBeCloseTo(60, 10);
    for (const meanAirwayPressure of [0.9, 60.1]) {
      expect(() => oxygenationIndex({ fio2: 1, meanAirwayPressure, pao2: 100 })).toThrow(
        OxygenInputError,
      );
    }
    expect(() => oxygenationIndex({ fio2: 1, meanAirwayPressure: 20, pao2: 9 })).toThrow(
      OxygenInputError,
    );
  });
});

describe("oxygenSaturationIndex — FiO2 (%) × MAP / SpO2 (PALICC 2015)", () => {
  it.each([
    [0.4, 12, 92, 5.2174, "mild"], // 40 × 12 / 92 = 5.217
    [0.6, 15, 90, 10, "moderate"], // 60 × 15 / 90 = 10
    [1, 20, 88, 22.7273, "severe"], // 100 × 20 / 88 = 22.73
    [0.5, 15, 100, 7.5, "moderate"], // 50 × 15 / 100 = 7.5, the mild/moderate edge
  ] as const)("FiO2 %s, MAP %s cmH2O, SpO2 %s % → OSI %s (%s)", (fio2, map, spo2, osi, band) => {
    const value = oxygenSaturationIndex({ fio2, meanAirwayPressure: map, spo2 });
    expect(value).toBeCloseTo(osi, 4);
    expect(palicc(value, OSI_BANDS)).toBe(band);
  });

  it("refuses SpO2 below 40 % and MAP outside 1–60 cmH2O (engine contract)", () => {
    // 100 × 10 / 40 = 25 at the lowest SpO2 accepted
    expect(oxygenSaturationIndex({ fio2: 1, meanAirwayPressure: 10, spo2: 40 })).toBeCloseTo(
      25,
      10,
    );
    expect(() => oxygenSaturationIndex({ fio2: 1, meanAirwayPressure: 10, spo2: 39.9 })).toThrow(
      OxygenInputError,
    );
    expect(() => oxygenSaturationIndex({ fio2: 1, meanAirwayPressure: 0, spo2: 90 })).toThrow(
      OxygenInputError,
    );
  });
});

describe("A–a gradient and a/A ratio — alveolar gas equation (Fenn, Rahn, Otis 1946; Curran-Everett 2006)", () => {
  // PAO2 = FiO2 × (PB − 47) − PaCO2 / 0.8, PH2O 47 mmHg at 37 °C, R 0.8.
  it("room air at sea level, PaCO2 40, PaO2 90: PAO2 99.73, A–a 9.73, a/A 0.902", () => {
    // PAO2 = 0.21 × 713 − 40 / 0.8 = 149.73 − 50 = 99.73
    // A–a = 99.73 − 90 = 9.73;  a/A = 90 / 99.73 = 0.9024
    const { indices, inconsistent } = assessBloodGas({
      fio2: 0.21,
      pao2: 90,
      paco2: 40,
      ageYears: 40,
    });
    expect(indices.alveolarPO2.value).toBeCloseTo(99.73, 8);
    expect(indices.alveolarArterialGradient.value).toBeCloseTo(9.73, 8);
    expect(indices.arterialAlveolarRatio.value).toBeCloseTo(0.9024, 4);
    expect(inconsistent).toBe(false);
    // Expected for age 40: 40 / 4 + 4 = 14 mmHg (common practice); 9.73 is within it.
    expect(indices.expectedAlveolarArterialGradient?.value).toBe(14);
    expect(indices.alveolarArterialGradient.value).toBeLessThan(14);
  });

  it("FiO2 0.5, PaCO2 40, PaO2 80: PAO2 306.5, A–a 226.5, a/A 0.261", () => {
    // PAO2 = 0.5 × 713 − 50 = 306.5;  A–a = 306.5 − 80 = 226.5;  a/A = 80 / 306.5 = 0.2610
    const { indices } = assessBloodGas({ fio2: 0.5, pao2: 80, paco2: 40 });
    expect(indices.alveolarPO2.value).toBeCloseTo(306.5, 8);
    expect(indices.alveolarArterialGradient.value).toBeCloseTo(226.5, 8);
    expect(indices.arterialAlveolarRatio.value).toBeCloseTo(0.261, 4);
  });

  it("uses the barometric pressure given: PB 630, room air, PaCO2 35 → PAO2 78.68", () => {
    // PAO2 = 0.21 × (630 − 47) − 35 / 0.8 = 122.43 − 43.75 = 78.68; A–a = 78.68 − 65 = 13.68
    const { indices } = assessBloodGas({
      fio2: 0.21,
      pao2: 65,
      paco2: 35,
      barometricPressure: 630,
    });
    expect(indices.alveolarPO2.value).toBeCloseTo(78.68, 8);
    expect(indices.alveolarArterialGradient.value).toBeCloseTo(13.68, 8);
  });

  it("calls PaO2 = PAO2 consistent and PaO2 0.1 mmHg above it inconsistent", () => {
    // FiO2 0.5, PaCO2 40: PAO2 = 306.5 exactly. At PaO2 306.5 the gradient is 0 and a/A 1.
    const equal = assessBloodGas({ fio2: 0.5, pao2: 306.5, paco2: 40 });
    expect(equal.inconsistent).toBe(false);
    expect(equal.indices.alveolarArterialGradient.value).toBeCloseTo(0, 10);
    expect(equal.indices.arterialAlveolarRatio.value).toBeCloseTo(1, 10);
    const above = assessBloodGas({ fio2: 0.5, pao2: 306.6, paco2: 40 });
    expect(above.inconsistent).toBe(true);
    expect(above.caveats.some((c) => c.includes("inconsistent"))).toBe(true);
  });
});

describe("expectedAaGradient — age/4 + 4 mmHg (bedside rule, common practice)", () => {
  it.each([
    [18, 8.5], // 18 / 4 + 4
    [40, 14], // 40 / 4 + 4
    [80, 24], // 80 / 4 + 4
    [120, 34], // 120 / 4 + 4
  ])("is %s years → %s mmHg", (age, expected) => {
    expect(expectedAaGradient(age)).toBe(expected);
  });

  it("is an adult rule: refuses ages below 18 and above 120 (engine contract)", () => {
    expect(() => expectedAaGradient(17.9)).toThrow(OxygenInputError);
    expect(() => expectedAaGradient(120.1)).toThrow(OxygenInputError);
  });
});

describe("oxygen content and delivery — CaO2 = 1.34·Hb·SaO2 + 0.003·PaO2, DO2 = 10·CO·CaO2 (textbook convention)", () => {
  it("normal arterial blood: Hb 15, SaO2 0.98, PaO2 100 → 20.0 mL/dL, and DO2 1000 mL/min at CO 5 L/min", () => {
    // bound 1.34 × 15 × 0.98 = 19.698; dissolved 0.003 × 100 = 0.3; total 19.998
    // DO2 = 10 × 5 × 19.998 = 999.9 mL/min (≈ 1000 at rest, common practice)
    const parts = oxygenContentParts({ hemoglobin: 15, saturation: 0.98, po2: 100 });
    expect(parts.bound).toBeCloseTo(19.698, 10);
    expect(parts.dissolved).toBeCloseTo(0.3, 10);
    expect(parts.total).toBeCloseTo(19.998, 10);
    expect(oxygenDelivery({ cardiacOutput: 5, arterialContent: parts.total })).toBeCloseTo(
      999.9,
      8,
    );
  });

  it("anaemic, desaturated blood: Hb 10, SaO2 0.90, PaO2 60 → 12.24 mL/dL; DO2 734.4 mL/min at CO 6", () => {
    // 1.34 × 10 × 0.90 = 12.06; 0.003 × 60 = 0.18; total 12.24; DO2 = 10 × 6 × 12.24 = 734.4
    const content = oxygenContent({ hemoglobin: 10, saturation: 0.9, po2: 60 });
    expect(content).toBeCloseTo(12.24, 10);
    expect(oxygenDelivery({ cardiacOutput: 6, arterialContent: content })).toBeCloseTo(734.4, 8);
  });

  it("takes SaO2 from the Severinghaus curve when none is measured (Severinghaus, J Appl Physiol 1979)", () => {
    // SaO2 at PaO2 80 = 1 / (23400 / (80³ + 150 × 80) + 1) = 1 / (23400 / 524000 + 1) = 0.957252
    // CaO2 = 1.34 × 12 × 0.957252 + 0.003 × 80 = 15.39262 + 0.24 = 15.63262
    // DO2 = 10 × 4.5 × 15.63262 = 703.468 mL/min
    const { indices } = assessBloodGas({
      fio2: 0.4,
      pao2: 80,
      paco2: 40,
      hemoglobin: 12,
      cardiacOutput: 4.5,
    });
    expect(indices.oxygenContent?.total.value).toBeCloseTo(15.6326, 4);
    expect(indices.oxygenContent?.dissolved.value).toBeCloseTo(0.24, 10);
    expect(indices.oxygenDelivery?.value).toBeCloseTo(703.47, 2);
  });

  it("accepts SaO2 0–1 and cardiac output 0.5–20 L/min inclusive, and refuses just outside (engine contract)", () => {
    // SaO2 0: only dissolved, 0.003 × 600 = 1.8; SaO2 1: 1.34 × 15 + 0.3 = 20.4
    expect(oxygenContent({ hemoglobin: 15, saturation: 0, po2: 600 })).toBeCloseTo(1.8, 10);
    expect(oxygenContent({ hemoglobin: 15, saturation: 1, po2: 100 })).toBeCloseTo(20.4, 10);
    expect(() => oxygenContent({ hemoglobin: 15, saturation: 1.01, po2: 100 })).toThrow(
      OxygenInputError,
    );
    // SaO2 typed as a percentage.
    expect(() => oxygenContent({ hemoglobin: 15, saturation: 98, po2: 100 })).toThrow(
      OxygenInputError,
    );
    // 10 × 0.5 × 20 = 100; 10 × 20 × 20 = 4000
    expect(oxygenDelivery({ cardiacOutput: 0.5, arterialContent: 20 })).toBeCloseTo(100, 10);
    expect(oxygenDelivery({ cardiacOutput: 20, arterialContent: 20 })).toBeCloseTo(4000, 10);
    expect(() => oxygenDelivery({ cardiacOutput: 0.4, arterialContent: 20 })).toThrow(
      OxygenInputError,
    );
    expect(() => oxygenDelivery({ cardiacOutput: 20.5, arterialContent: 20 })).toThrow(
      OxygenInputError,
    );
  });
});

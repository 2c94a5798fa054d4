import { describe, expect, it } from "vitest";
import { expectedAaGradient, oxygenationIndex, oxygenSaturationIndex, pfRatio, roxIndex, sfRatio } from "@/lib/oxygen";

describe("pfRatio — PaO2/FiO2 (Horovitz 1974)", () => {
  it("is ≈ 475 mmHg for a healthy adult on room air (PaO2 100; common practice: 400–500)", () => {
    expect(pfRatio(100, 0.21)).toBeCloseTo(100 / 0.21, 10);
    expect(pfRatio(100, 0.21)).toBeGreaterThan(400);
  });

  it("is 200 at PaO2 100 on FiO2 0.5 — the Berlin mild/moderate boundary (Berlin 2012)", () => {
    expect(pfRatio(100, 0.5)).toBe(200);
  });
});

describe("sfRatio — SpO2/FiO2 (Rice et al., Chest 2007)", () => {
  it("is SpO2 in % over FiO2 as a fraction", () => {
    expect(sfRatio(94, 0.4)).toBeCloseTo(235, 10);
  });

  // Rice 2007 regression S/F = 64 + 0.84 × P/F, recalled from memory: S/F 235
  // and 315 correspond to P/F 200 and 300 (±5).
  it("maps P/F 200 and 300 to S/F ≈ 235 and ≈ 315 through Rice's regression", () => {
    expect(Math.abs(64 + 0.84 * 200 - 235)).toBeLessThanOrEqual(5);
    expect(Math.abs(64 + 0.84 * 300 - 315)).toBeLessThanOrEqual(5);
    // And the engine's S/F for those saturations at the corresponding FiO2:
    expect(sfRatio(94, 0.4)).toBeCloseTo(235, 10);
    expect(sfRatio(94.5, 0.3)).toBeCloseTo(315, 10);
  });
});

describe("roxIndex — (SpO2/FiO2)/RR (Roca et al. 2016, 2019)", () => {
  it("is (SpO2 % / FiO2) / RR", () => {
    expect(roxIndex({ spo2: 92, fio2: 0.6, respiratoryRate: 30 })).toBeCloseTo(92 / 0.6 / 30, 12);
  });

  it("puts SpO2 88 % on FiO2 0.7 at RR 32 below the 4.88 threshold Roca 2019 used at 12 h", () => {
    expect(roxIndex({ spo2: 88, fio2: 0.7, respiratoryRate: 32 })).toBeLessThan(4.88);
    expect(roxIndex({ spo2: 96, fio2: 0.4, respiratoryRate: 20 })).toBeGreaterThan(4.88);
  });
});

describe("oxygenationIndex and oxygenSaturationIndex — FiO2 as % (PALICC 2015; Thomas 2010)", () => {
  it("OI = FiO2 (%) × MAP / PaO2: FiO2 0.6, MAP 15, PaO2 60 → 15", () => {
    expect(oxygenationIndex({ fio2: 0.6, meanAirwayPressure: 15, pao2: 60 })).toBeCloseTo((60 * 15) / 60, 12);
  });

  it("OSI = FiO2 (%) × MAP / SpO2: FiO2 0.6, MAP 15, SpO2 90 → 10", () => {
    expect(oxygenSaturationIndex({ fio2: 0.6, meanAirwayPressure: 15, spo2: 90 })).toBeCloseTo((60 * 15) / 90, 12);
  });

  // PALICC 2015 severity bands, recalled from memory: OI 4–8 mild, 8–16
  // moderate, ≥ 16 severe; OSI 5–7.5, 7.5–12.3, ≥ 12.3.
  it("lands a severe case in PALICC's severe bands and a mild case in the mild bands", () => {
    expect(oxygenationIndex({ fio2: 1, meanAirwayPressure: 20, pao2: 60 })).toBeGreaterThanOrEqual(16);
    expect(oxygenSaturationIndex({ fio2: 1, meanAirwayPressure: 20, spo2: 88 })).toBeGreaterThanOrEqual(12.3);
    const mildOi = oxygenationIndex({ fio2: 0.4, meanAirwayPressure: 12, pao2: 80 });
    expect(mildOi).toBeGreaterThanOrEqual(4);
    expect(mildOi).toBeLessThan(8);
  });
});

describe("expectedAaGradient — age/4 + 4 (bedside rule, common practice)", () => {
  it("is 14 mmHg at 40 years and 24 mmHg at 80 years", () => {
    expect(expectedAaGradient(40)).toBe(14);
    expect(expectedAaGradient(80)).toBe(24);
  });
});

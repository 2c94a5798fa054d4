import { describe, expect, it } from "vitest";
import { barometricPressureAtAltitude, classifyOxygenation } from "@/lib/oxygen";

// Berlin: ARDS Definition Task Force, JAMA 2012;307:2526–33 — mild
// 200 < P/F ≤ 300 with PEEP or CPAP ≥ 5 (CPAP allowed only for mild),
// moderate 100 < P/F ≤ 200, severe P/F ≤ 100, both with PEEP ≥ 5; above
// 1000 m use P/F × PB/760.
describe("classifyOxygenation — Berlin definition 2012", () => {
  const invasive = (pao2: number, fio2: number, peep = 8) =>
    classifyOxygenation({ pao2, fio2, peep, support: "invasive" }).berlin.category;

  it.each([
    [151, 0.5, "none"],
    [150, 0.5, "mild"],
    [100.5, 0.5, "mild"],
    [100, 0.5, "moderate"],
    [50.5, 0.5, "moderate"],
    [50, 0.5, "severe"],
    [40, 1, "severe"],
  ] as const)(
    "PaO2 %s on FiO2 %s (P/F at the 300/200/100 boundaries) → %s",
    (pao2, fio2, category) => {
      expect(invasive(pao2, fio2)).toBe(category);
    },
  );

  it("requires PEEP ≥ 5 cmH2O: PEEP 4 is not classifiable, PEEP 5 is", () => {
    expect(invasive(60, 0.5, 4)).toBe("not-classifiable");
    expect(invasive(60, 0.5, 5)).toBe("moderate");
  });

  it("names the deciding criterion and its numbers", () => {
    const { berlin } = classifyOxygenation({ pao2: 60, fio2: 0.5, peep: 10, support: "invasive" });
    expect(berlin.criterion).toContain("P/F 120");
    expect(berlin.values).toEqual({ pfRatio: 120, peep: 10 });
    expect(berlin.source).toContain("JAMA 2012");
  });

  it("accepts non-invasive CPAP for mild only", () => {
    expect(
      classifyOxygenation({ pao2: 125, fio2: 0.5, peep: 5, support: "niv" }).berlin.category,
    ).toBe("mild");
    expect(
      classifyOxygenation({ pao2: 90, fio2: 0.5, peep: 5, support: "niv" }).berlin.category,
    ).toBe("not-classifiable");
  });

  it("does not classify on HFNC, low-flow oxygen or without a PaO2", () => {
    expect(
      classifyOxygenation({ pao2: 60, fio2: 0.6, support: "hfnc", flow: 50 }).berlin.category,
    ).toBe("not-classifiable");
    expect(
      classifyOxygenation({ pao2: 60, fio2: 0.6, peep: 5, support: "conventional" }).berlin
        .category,
    ).toBe("not-classifiable");
    expect(
      classifyOxygenation({ spo2: 88, fio2: 0.6, peep: 10, support: "invasive" }).berlin.category,
    ).toBe("not-classifiable");
  });

  it("corrects P/F by PB/760 above 1000 m (Berlin footnote)", () => {
    const pb = barometricPressureAtAltitude(2500);
    // P/F 210 at sea level would be mild; × PB/760 (≈ 0.74) makes it moderate.
    const { berlin } = classifyOxygenation({
      pao2: 105,
      fio2: 0.5,
      peep: 8,
      support: "invasive",
      barometricPressure: pb,
    });
    expect(berlin.category).toBe("moderate");
    expect(berlin.values.adjustedPfRatio).toBeCloseTo((210 * pb) / 760, 10);
    // At 500 m no correction applies.
    const low = classifyOxygenation({
      pao2: 105,
      fio2: 0.5,
      peep: 8,
      support: "invasive",
      barometricPressure: barometricPressureAtAltitude(500),
    });
    expect(low.berlin.category).toBe("mild");
  });
});

// Global definition: Matthay MA et al., AJRCCM 2024;209:37–47 — non-intubated
// on HFNC ≥ 30 L/min or NIV/CPAP ≥ 5 cmH2O: P/F ≤ 300 or S/F ≤ 315 (SpO2 ≤ 97 %),
// no severity; intubated: mild 200 < P/F ≤ 300 or 235 < S/F ≤ 315, moderate
// 100 < P/F ≤ 200 or 148 < S/F ≤ 235, severe P/F ≤ 100 or S/F ≤ 148.
describe("classifyOxygenation — global definition 2023", () => {
  const intubatedSf = (spo2: number, fio2: number) =>
    classifyOxygenation({ spo2, fio2, peep: 8, support: "invasive" }).global.category;

  it.each([
    [94.8, 0.3, "none"], // S/F 316
    [94.5, 0.3, "mild"], // S/F 315
    [94.2, 0.4, "mild"], // S/F 235.5
    [94, 0.4, "moderate"], // S/F 235
    [89.5, 0.6, "moderate"], // S/F 149.2
    [88.8, 0.6, "severe"], // S/F 148
    [85, 1, "severe"],
  ] as const)(
    "intubated, SpO2 %s on FiO2 %s → %s (S/F bands 315/235/148)",
    (spo2, fio2, category) => {
      expect(intubatedSf(spo2, fio2)).toBe(category);
    },
  );

  it.each([
    [150, 0.5, "mild"],
    [100, 0.5, "moderate"],
    [50, 0.5, "severe"],
    [151, 0.5, "none"],
  ] as const)(
    "intubated, PaO2 %s on FiO2 %s → %s (P/F bands 300/200/100)",
    (pao2, fio2, category) => {
      expect(classifyOxygenation({ pao2, fio2, support: "invasive" }).global.category).toBe(
        category,
      );
    },
  );

  it("does not use S/F above SpO2 97 %", () => {
    const { global } = classifyOxygenation({ spo2: 98, fio2: 0.4, support: "invasive" });
    expect(global.category).toBe("not-classifiable");
    expect(global.criterion).toContain("97");
  });

  it("reports both ratios and 'both' when P/F and S/F fall in the same band", () => {
    // P/F 90 / 0.5 = 180 (100 < 180 ≤ 200: moderate); S/F 96 / 0.5 = 192 (148 < 192 ≤ 235: moderate).
    const { global } = classifyOxygenation({ pao2: 90, spo2: 96, fio2: 0.5, support: "invasive" });
    expect(global.category).toBe("moderate");
    expect(global.classifiedBy).toBe("both");
    expect(global.values.pfRatio).toBe(180);
    expect(global.values.sfRatio).toBe(192);
  });

  it("includes HFNC at ≥ 30 L/min and NIV ≥ 5 cmH2O without severity", () => {
    expect(
      classifyOxygenation({ spo2: 93, fio2: 0.5, support: "hfnc", flow: 30 }).global.category,
    ).toBe("ards");
    expect(
      classifyOxygenation({ spo2: 93, fio2: 0.5, support: "hfnc", flow: 25 }).global.category,
    ).toBe("not-classifiable");
    expect(
      classifyOxygenation({ pao2: 70, fio2: 0.6, support: "niv", peep: 5 }).global.category,
    ).toBe("ards");
    expect(
      classifyOxygenation({ pao2: 70, fio2: 0.6, support: "niv", peep: 4 }).global.category,
    ).toBe("not-classifiable");
    expect(
      classifyOxygenation({ pao2: 160, fio2: 0.5, support: "hfnc", flow: 40 }).global.category,
    ).toBe("none");
  });

  it("requires respiratory support: low-flow oxygen is not classifiable (resource-limited variant not applied)", () => {
    expect(
      classifyOxygenation({ spo2: 90, fio2: 0.4, support: "conventional" }).global.category,
    ).toBe("not-classifiable");
    expect(classifyOxygenation({ spo2: 90, fio2: 0.4 }).global.category).toBe("not-classifiable");
  });
});

// Matthay MA et al., AJRCCM 2024;209:37–47: the oxygenation criterion is P/F ≤ 300
// or S/F ≤ 315 (S/F only with SpO2 ≤ 97 %); intubated bands mild 200 < P/F ≤ 300 or
// 235 < S/F ≤ 315, moderate 100 < P/F ≤ 200 or 148 < S/F ≤ 235, severe P/F ≤ 100 or
// S/F ≤ 148. The paper lists P/F and S/F as alternatives; when they fall in
// different bands Tidemark reports the worse one (its reading of the definition).
// Each example's ratios are worked out from the inputs and those thresholds.
describe("classifyOxygenation — global definition 2023 with both P/F and S/F", () => {
  const both = (
    pao2: number,
    spo2: number,
    fio2: number,
    rest: { support: "invasive" | "hfnc" | "niv"; peep?: number; flow?: number },
  ) => classifyOxygenation({ pao2, spo2, fio2, ...rest }).global;

  it("grades by S/F when it is the worse: S/F 146.7 ≤ 148 severe, P/F 103.3 moderate → severe", () => {
    // FiO2 0.6: PaO2 62 → P/F 103.3 (100 < 103.3 ≤ 200); SpO2 88 % → S/F 146.7 (≤ 148).
    const global = both(62, 88, 0.6, { support: "invasive", peep: 10 });
    expect(global.category).toBe("severe");
    expect(global.classifiedBy).toBe("S/F");
    expect(global.values.pfRatio).toBeCloseTo(62 / 0.6, 10);
    expect(global.values.sfRatio).toBeCloseTo(88 / 0.6, 10);
    expect(global.criterion).toContain("S/F 147 ≤ 148");
    expect(global.criterion).toContain("SpO2 88 % ≤ 97 %");
    expect(global.criterion).toContain("P/F 103 would be moderate");
  });

  it("grades by P/F when it is the worse: P/F 195 moderate, S/F 237.5 mild → moderate", () => {
    // FiO2 0.4: PaO2 78 → P/F 195 (100 < 195 ≤ 200); SpO2 95 % → S/F 237.5 (235 < 237.5 ≤ 315).
    const global = both(78, 95, 0.4, { support: "invasive", peep: 8 });
    expect(global.category).toBe("moderate");
    expect(global.classifiedBy).toBe("P/F");
    expect(global.values).toMatchObject({ pfRatio: 195, sfRatio: 237.5 });
    expect(global.criterion).toContain("S/F 238 would be mild");
  });

  it("meets the criterion on S/F alone when P/F is above 300 (intubated: mild)", () => {
    // FiO2 0.3: PaO2 95 → P/F 316.7 (> 300); SpO2 94 % → S/F 313.3 (235 < 313.3 ≤ 315).
    const global = both(95, 94, 0.3, { support: "invasive", peep: 5 });
    expect(global.category).toBe("mild");
    expect(global.classifiedBy).toBe("S/F");
    expect(global.criterion).toContain("P/F 317 would be outside the criterion");
  });

  it("meets the criterion on P/F alone when S/F is above 315 (intubated: mild)", () => {
    // FiO2 0.3: PaO2 85 → P/F 283.3 (200 < 283.3 ≤ 300); SpO2 97 % → S/F 323.3 (> 315).
    const global = both(85, 97, 0.3, { support: "invasive", peep: 5 });
    expect(global.category).toBe("mild");
    expect(global.classifiedBy).toBe("P/F");
  });

  it("meets the non-intubated criterion on S/F alone, without severity (HFNC 40 L/min)", () => {
    // Same ratios as above on HFNC ≥ 30 L/min: S/F 313.3 ≤ 315 meets it; P/F 316.7 does not.
    const global = both(95, 94, 0.3, { support: "hfnc", flow: 40 });
    expect(global.category).toBe("ards");
    expect(global.classifiedBy).toBe("S/F");
    expect(global.values).toMatchObject({ flow: 40 });
  });

  it("says 'both' on NIV when both ratios meet the criterion, whatever their intubated bands would be", () => {
    // NIV 8 cmH2O, FiO2 0.5: PaO2 50 → P/F 100 (≤ 300); SpO2 94 % → S/F 188 (≤ 315). No grades off the tube.
    const global = both(50, 94, 0.5, { support: "niv", peep: 8 });
    expect(global.category).toBe("ards");
    expect(global.classifiedBy).toBe("both");
  });

  it("is outside the criterion only when both ratios are: P/F 333.3 > 300 and S/F 320 > 315", () => {
    // FiO2 0.3: PaO2 100 → P/F 333.3; SpO2 96 % → S/F 320.
    const global = both(100, 96, 0.3, { support: "invasive", peep: 5 });
    expect(global.category).toBe("none");
    expect(global.classifiedBy).toBe("both");
  });

  it("leaves S/F out above SpO2 97 % and grades by P/F: P/F 275 mild, SpO2 98 %", () => {
    // FiO2 0.4: PaO2 110 → P/F 275 (200 < 275 ≤ 300); SpO2 98 % > 97 %: S/F (245) not used.
    const global = both(110, 98, 0.4, { support: "invasive", peep: 8 });
    expect(global.category).toBe("mild");
    expect(global.classifiedBy).toBe("P/F");
    expect(global.criterion).toContain("S/F not used: SpO2 98 % > 97 %");
  });

  it("puts the band edges in the lower band for both ratios: P/F 200 and S/F 235 are both moderate", () => {
    // FiO2 0.4: PaO2 80 → P/F 200 (≤ 200); SpO2 94 % → S/F 235 (≤ 235).
    const global = both(80, 94, 0.4, { support: "invasive", peep: 8 });
    expect(global.category).toBe("moderate");
    expect(global.classifiedBy).toBe("both");
  });

  it("names the only ratio available, and names none when not classifiable", () => {
    expect(
      classifyOxygenation({ pao2: 50, fio2: 0.5, support: "invasive" }).global.classifiedBy,
    ).toBe("P/F");
    expect(
      classifyOxygenation({ spo2: 85, fio2: 1, support: "invasive" }).global.classifiedBy,
    ).toBe("S/F");
    expect(
      classifyOxygenation({ spo2: 98, fio2: 0.4, support: "invasive" }).global.classifiedBy,
    ).toBeUndefined();
    // Berlin grades by P/F only and carries no classifiedBy.
    expect(
      classifyOxygenation({ pao2: 62, spo2: 88, fio2: 0.6, peep: 10, support: "invasive" }).berlin
        .classifiedBy,
    ).toBeUndefined();
  });
});

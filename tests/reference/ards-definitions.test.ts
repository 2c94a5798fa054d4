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
  ] as const)("PaO2 %s on FiO2 %s (P/F at the 300/200/100 boundaries) → %s", (pao2, fio2, category) => {
    expect(invasive(pao2, fio2)).toBe(category);
  });

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
    expect(classifyOxygenation({ pao2: 125, fio2: 0.5, peep: 5, support: "niv" }).berlin.category).toBe("mild");
    expect(classifyOxygenation({ pao2: 90, fio2: 0.5, peep: 5, support: "niv" }).berlin.category).toBe("not-classifiable");
  });

  it("does not classify on HFNC, low-flow oxygen or without a PaO2", () => {
    expect(classifyOxygenation({ pao2: 60, fio2: 0.6, support: "hfnc", flow: 50 }).berlin.category).toBe("not-classifiable");
    expect(classifyOxygenation({ pao2: 60, fio2: 0.6, peep: 5, support: "conventional" }).berlin.category).toBe("not-classifiable");
    expect(classifyOxygenation({ spo2: 88, fio2: 0.6, peep: 10, support: "invasive" }).berlin.category).toBe("not-classifiable");
  });

  it("corrects P/F by PB/760 above 1000 m (Berlin footnote)", () => {
    const pb = barometricPressureAtAltitude(2500);
    // P/F 210 at sea level would be mild; × PB/760 (≈ 0.74) makes it moderate.
    const { berlin } = classifyOxygenation({ pao2: 105, fio2: 0.5, peep: 8, support: "invasive", barometricPressure: pb });
    expect(berlin.category).toBe("moderate");
    expect(berlin.values.adjustedPfRatio).toBeCloseTo((210 * pb) / 760, 10);
    // At 500 m no correction applies.
    const low = classifyOxygenation({ pao2: 105, fio2: 0.5, peep: 8, support: "invasive", barometricPressure: barometricPressureAtAltitude(500) });
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
  ] as const)("intubated, SpO2 %s on FiO2 %s → %s (S/F bands 315/235/148)", (spo2, fio2, category) => {
    expect(intubatedSf(spo2, fio2)).toBe(category);
  });

  it.each([
    [150, 0.5, "mild"],
    [100, 0.5, "moderate"],
    [50, 0.5, "severe"],
    [151, 0.5, "none"],
  ] as const)("intubated, PaO2 %s on FiO2 %s → %s (P/F bands 300/200/100)", (pao2, fio2, category) => {
    expect(classifyOxygenation({ pao2, fio2, support: "invasive" }).global.category).toBe(category);
  });

  it("does not use S/F above SpO2 97 %", () => {
    const { global } = classifyOxygenation({ spo2: 98, fio2: 0.4, support: "invasive" });
    expect(global.category).toBe("not-classifiable");
    expect(global.criterion).toContain("97");
  });

  it("lets P/F decide when both a PaO2 and an SpO2 are given", () => {
    const { global } = classifyOxygenation({ pao2: 90, spo2: 96, fio2: 0.5, support: "invasive" });
    expect(global.category).toBe("moderate");
    expect(global.values.pfRatio).toBe(180);
  });

  it("includes HFNC at ≥ 30 L/min and NIV ≥ 5 cmH2O without severity", () => {
    expect(classifyOxygenation({ spo2: 93, fio2: 0.5, support: "hfnc", flow: 30 }).global.category).toBe("ards");
    expect(classifyOxygenation({ spo2: 93, fio2: 0.5, support: "hfnc", flow: 25 }).global.category).toBe("not-classifiable");
    expect(classifyOxygenation({ pao2: 70, fio2: 0.6, support: "niv", peep: 5 }).global.category).toBe("ards");
    expect(classifyOxygenation({ pao2: 70, fio2: 0.6, support: "niv", peep: 4 }).global.category).toBe("not-classifiable");
    expect(classifyOxygenation({ pao2: 160, fio2: 0.5, support: "hfnc", flow: 40 }).global.category).toBe("none");
  });

  it("requires respiratory support: low-flow oxygen is not classifiable (resource-limited variant not applied)", () => {
    expect(classifyOxygenation({ spo2: 90, fio2: 0.4, support: "conventional" }).global.category).toBe("not-classifiable");
    expect(classifyOxygenation({ spo2: 90, fio2: 0.4 }).global.category).toBe("not-classifiable");
  });
});

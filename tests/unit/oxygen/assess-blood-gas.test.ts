import { describe, expect, it } from "vitest";
import {
  assessBloodGas,
  classifyOxygenation,
  OxygenInputError,
  RANGES,
  SOURCES,
} from "@/lib/oxygen";

const saturation = (po2: number) => 1 / (23400 / (po2 ** 3 + 150 * po2) + 1); // Severinghaus 1979

const full = {
  fio2: 0.6,
  pao2: 75,
  paco2: 42,
  hemoglobin: 11,
  spo2: 94,
  peep: 12,
  meanAirwayPressure: 18,
  respiratoryRate: 24,
  barometricPressure: 740,
  support: "invasive" as const,
  ageYears: 60,
  cardiacOutput: 5.5,
};

describe("assessBloodGas", () => {
  it("computes every index whose inputs are given, from the published formulas", () => {
    const { indices } = assessBloodGas(full);
    const alveolar = 0.6 * (740 - 47) - 42 / 0.8;
    const content = 1.34 * 11 * 0.94 + 0.003 * 75;
    expect(indices.pfRatio.value).toBeCloseTo(75 / 0.6, 10);
    expect(indices.alveolarPO2.value).toBeCloseTo(alveolar, 10);
    expect(indices.alveolarArterialGradient.value).toBeCloseTo(alveolar - 75, 10);
    expect(indices.arterialAlveolarRatio.value).toBeCloseTo(75 / alveolar, 10);
    expect(indices.expectedAlveolarArterialGradient?.value).toBe(19);
    expect(indices.sfRatio?.value).toBeCloseTo(94 / 0.6, 10);
    expect(indices.oxygenContent?.total.value).toBeCloseTo(content, 10);
    expect(indices.oxygenContent?.bound.value).toBeCloseTo(1.34 * 11 * 0.94, 10);
    expect(indices.oxygenContent?.dissolved.value).toBeCloseTo(0.225, 10);
    expect(indices.oxygenContent?.boundToDissolvedRatio.value).toBeCloseTo(
      (1.34 * 11 * 0.94) / 0.225,
      10,
    );
    expect(indices.oxygenDelivery?.value).toBeCloseTo(10 * 5.5 * content, 10);
    expect(indices.oxygenationIndex?.value).toBeCloseTo((60 * 18) / 75, 10);
    expect(indices.oxygenSaturationIndex?.value).toBeCloseTo((60 * 18) / 94, 10);
    expect(indices.roxIndex?.value).toBeCloseTo(94 / 0.6 / 24, 10);
  });

  it("gives each index a basis with inputs, formula, source and assumptions", () => {
    const { indices } = assessBloodGas(full);
    expect(indices.alveolarPO2.basis).toMatchObject({
      formula: "PAO2 = FiO2 × (PB − PH2O) − PaCO2 / R",
      inputs: {
        FiO2: { value: 0.6, unit: "fraction" },
        PB: { value: 740, unit: "mmHg" },
        R: { value: 0.8, unit: "ratio" },
      },
      source: SOURCES.alveolarGas,
    });
    expect(indices.oxygenationIndex?.basis.assumptions).toContain(
      "FiO2 enters as a percentage, as published.",
    );
    for (const value of [
      indices.pfRatio,
      indices.sfRatio,
      indices.roxIndex,
      indices.oxygenContent?.total,
    ]) {
      expect(value?.basis.name.length).toBeGreaterThan(0);
      expect(value?.basis.source.length).toBeGreaterThan(0);
      expect(value?.unit.length).toBeGreaterThan(0);
    }
  });

  it("leaves out indices whose inputs are missing", () => {
    const { indices } = assessBloodGas({ fio2: 0.4, pao2: 80, paco2: 40 });
    expect(Object.keys(indices).sort()).toEqual([
      "alveolarArterialGradient",
      "alveolarPO2",
      "arterialAlveolarRatio",
      "pfRatio",
    ]);
  });

  it("takes SaO2 from co-oximetry first, then SpO2, then the standard curve", () => {
    const measured = assessBloodGas({
      fio2: 0.4,
      pao2: 80,
      paco2: 40,
      hemoglobin: 12,
      sao2: 0.93,
      spo2: 95,
    });
    expect(measured.indices.oxygenContent?.bound.value).toBeCloseTo(1.34 * 12 * 0.93, 10);
    const oximetry = assessBloodGas({ fio2: 0.4, pao2: 80, paco2: 40, hemoglobin: 12, spo2: 95 });
    expect(oximetry.indices.oxygenContent?.bound.value).toBeCloseTo(1.34 * 12 * 0.95, 10);
    const computed = assessBloodGas({ fio2: 0.4, pao2: 80, paco2: 40, hemoglobin: 12 });
    expect(computed.indices.oxygenContent?.bound.value).toBeCloseTo(1.34 * 12 * saturation(80), 10);
    expect(computed.indices.oxygenContent?.total.basis.assumptions.join(" ")).toContain(
      "Severinghaus",
    );
  });

  it("flags a PaO2 above PAO2 as inconsistent", () => {
    const result = assessBloodGas({ fio2: 0.21, pao2: 115, paco2: 40 });
    expect(result.inconsistent).toBe(true);
    expect(result.indices.alveolarArterialGradient.value).toBeLessThan(0);
    expect(result.caveats.some((caveat) => caveat.includes("inconsistent"))).toBe(true);
    expect(assessBloodGas({ fio2: 0.21, pao2: 90, paco2: 40 }).inconsistent).toBe(false);
  });

  it("warns about S/F above 97 %, an SpO2 far from the PaO2, and ROX off high-flow oxygen", () => {
    const { caveats } = assessBloodGas({
      fio2: 0.4,
      pao2: 60,
      paco2: 40,
      spo2: 98,
      respiratoryRate: 20,
      support: "niv",
      peep: 6,
    });
    expect(caveats.some((caveat) => caveat.includes("S/F ratio is not interpretable"))).toBe(true);
    expect(caveats.some((caveat) => caveat.includes("differs from the"))).toBe(true);
    expect(caveats).toContain("The ROX index is validated on high-flow nasal oxygen only.");
  });

  it("accepts any SpO2 an oximeter shows: under 70 % marked, under 40 % no SpO2 indices", () => {
    const marked = assessBloodGas({ ...full, spo2: 60 });
    expect(marked.indices.sfRatio?.value).toBeCloseTo(60 / 0.6, 10);
    expect(marked.caveats.filter((c) => c.includes("below oximeter accuracy"))).toHaveLength(1);
    const deep = assessBloodGas({ ...full, spo2: 30 });
    expect(deep.indices.sfRatio).toBeUndefined();
    expect(deep.indices.oxygenSaturationIndex).toBeUndefined();
    expect(deep.indices.roxIndex).toBeUndefined();
    expect(deep.indices.pfRatio.value).toBeCloseTo(75 / 0.6, 10);
    expect(deep.caveats).toContain(
      "SpO2 30 % is below oximeter accuracy and under 40 %: S/F, OSI, ROX and the S/F criterion are not computed from it.",
    );
    expect(deep.classification.global.values.sfRatio).toBeUndefined();
    expect(assessBloodGas({ ...full, spo2: 0 }).indices.sfRatio).toBeUndefined();
    expect(assessBloodGas(full).caveats.some((c) => c.includes("below oximeter accuracy"))).toBe(
      false,
    );
  });

  it("includes the Berlin and global classification of the same inputs", () => {
    const { classification } = assessBloodGas(full);
    expect(classification).toEqual(
      classifyOxygenation({
        pao2: 75,
        spo2: 94,
        fio2: 0.6,
        peep: 12,
        support: "invasive",
        barometricPressure: 740,
      }),
    );
    expect(classification.berlin.category).toBe("moderate");
  });

  it("refuses an out-of-range input even when no index would use it", () => {
    // Cardiac output without haemoglobin yields no DO2, but a typo is still a typo.
    expect(() =>
      assessBloodGas({ fio2: 0.4, pao2: 80, paco2: 40, cardiacOutput: 55 }),
    ).toThrowError(
      new OxygenInputError({ field: "cardiacOutput", value: 55, ...RANGES.cardiacOutput }),
    );
  });
});

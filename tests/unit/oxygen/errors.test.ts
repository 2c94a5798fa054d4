import { describe, expect, it } from "vitest";
import {
  alveolarPO2,
  barometricPressureAtAltitude,
  classifyOxygenation,
  drivingPressure,
  forecastFio2Change,
  mechanicalPower,
  MIN_ALVEOLAR_PO2,
  OxygenInputError,
  oxygenContent,
  oxygenationIndex,
  pfRatio,
  po2FromSaturation,
  predictedBodyWeight,
  RANGES,
  roxIndex,
  saturationFromPO2,
  sfRatio,
  staticCompliance,
  toGramsPerDecilitre,
  toMmHg,
  type InputRange,
} from "@/lib/oxygen";

function thrown(call: () => unknown): OxygenInputError {
  try {
    call();
  } catch (error) {
    if (error instanceof OxygenInputError) return error;
    throw error;
  }
  throw new Error("expected an OxygenInputError");
}

describe("OxygenInputError", () => {
  it("reads like 'fio2 must be between 0.21 and 1 (fraction); got 1.4'", () => {
    const error = thrown(() => pfRatio(80, 1.4));
    expect(error.message).toBe("fio2 must be between 0.21 and 1 (fraction); got 1.4");
    expect(error).toBeInstanceOf(Error);
    expect(error.name).toBe("OxygenInputError");
    expect({
      field: error.field,
      min: error.min,
      max: error.max,
      unit: error.unit,
      value: error.value,
    }).toEqual({
      field: "fio2",
      min: 0.21,
      max: 1,
      unit: "fraction",
      value: 1.4,
    });
  });
});

type Case = [name: string, field: string, range: InputRange, call: (value: number) => unknown];

const cases: Case[] = [
  ["alveolarPO2", "fio2", RANGES.fio2, (fio2) => alveolarPO2({ fio2, paco2: 40 })],
  ["alveolarPO2", "paco2", RANGES.paco2, (paco2) => alveolarPO2({ fio2: 1, paco2 })],
  [
    "alveolarPO2",
    "barometricPressure",
    RANGES.barometricPressure,
    (barometricPressure) => alveolarPO2({ fio2: 1, paco2: 40, barometricPressure }),
  ],
  [
    "alveolarPO2",
    "waterVapourPressure",
    RANGES.waterVapourPressure,
    (waterVapourPressure) => alveolarPO2({ fio2: 1, paco2: 40, waterVapourPressure }),
  ],
  [
    "alveolarPO2",
    "respiratoryQuotient",
    RANGES.respiratoryQuotient,
    (respiratoryQuotient) => alveolarPO2({ fio2: 1, paco2: 40, respiratoryQuotient }),
  ],
  ["saturationFromPO2", "po2", RANGES.po2, (po2) => saturationFromPO2(po2)],
  ["po2FromSaturation", "so2", RANGES.saturation, (so2) => po2FromSaturation(so2)],
  [
    "oxygenContent",
    "hemoglobin",
    RANGES.hemoglobin,
    (hemoglobin) => oxygenContent({ hemoglobin, saturation: 0.9, po2: 60 }),
  ],
  [
    "oxygenContent",
    "saturation",
    RANGES.saturationFraction,
    (saturation) => oxygenContent({ hemoglobin: 12, saturation, po2: 60 }),
  ],
  ["pfRatio", "pao2", RANGES.pao2, (pao2) => pfRatio(pao2, 0.5)],
  ["sfRatio", "spo2", RANGES.spo2Index, (spo2) => sfRatio(spo2, 0.5)],
  [
    "roxIndex",
    "respiratoryRate",
    RANGES.respiratoryRate,
    (respiratoryRate) => roxIndex({ spo2: 92, fio2: 0.5, respiratoryRate }),
  ],
  [
    "oxygenationIndex",
    "meanAirwayPressure",
    RANGES.meanAirwayPressure,
    (meanAirwayPressure) => oxygenationIndex({ fio2: 0.5, meanAirwayPressure, pao2: 70 }),
  ],
  [
    "predictedBodyWeight",
    "heightCm",
    RANGES.heightCm,
    (heightCm) => predictedBodyWeight({ heightCm, sex: "female" }),
  ],
  [
    "staticCompliance",
    "tidalVolumeMl",
    RANGES.tidalVolumeMl,
    (tidalVolumeMl) => staticCompliance({ tidalVolumeMl, plateauPressure: 25, peep: 10 }),
  ],
  [
    "drivingPressure",
    "peep",
    RANGES.peep,
    (peep) => drivingPressure({ plateauPressure: 60, peep }),
  ],
  [
    "barometricPressureAtAltitude",
    "metres",
    RANGES.altitude,
    (metres) => barometricPressureAtAltitude(metres),
  ],
  [
    "forecastFio2Change",
    "nextFio2",
    RANGES.fio2,
    (nextFio2) => forecastFio2Change({ fio2: 0.5, pao2: 70, paco2: 40, hemoglobin: 12, nextFio2 }),
  ],
  [
    "forecastFio2Change",
    "hemoglobin",
    RANGES.hemoglobin,
    (hemoglobin) =>
      forecastFio2Change({ fio2: 0.5, pao2: 70, paco2: 40, hemoglobin, nextFio2: 0.6 }),
  ],
  [
    "classifyOxygenation",
    "flow",
    RANGES.flow,
    (flow) => classifyOxygenation({ fio2: 0.5, spo2: 92, support: "hfnc", flow }),
  ],
  [
    "toMmHg",
    "value",
    { ...RANGES.pressureMmHg, max: RANGES.pressureMmHg.max },
    (value) => toMmHg(value, "mmHg"),
  ],
];

describe.each(cases)("%s refuses a bad %s", (_name, field, range, call) => {
  const span = range.max - range.min;
  it.each([
    ["below the range", range.min - Math.max(span * 0.01, 0.001)],
    ["above the range", range.max + Math.max(span * 0.01, 0.001)],
    ["NaN", Number.NaN],
    ["Infinity", Number.POSITIVE_INFINITY],
    ["-Infinity", Number.NEGATIVE_INFINITY],
  ])("%s", (_label, value) => {
    const error = thrown(() => call(value));
    expect(error.field).toBe(field);
    expect([error.min, error.max, error.unit]).toEqual([range.min, range.max, range.unit]);
    expect(error.message).toBe(new OxygenInputError({ field, value, ...range }).message);
  });

  it("accepts both ends of the range", () => {
    expect(() => call(range.min)).not.toThrow();
    expect(() => call(range.max)).not.toThrow();
  });
});

describe("ranges that depend on other inputs", () => {
  it("refuses a PaCO2 that would leave no alveolar oxygen, naming the highest acceptable one", () => {
    const error = thrown(() => alveolarPO2({ fio2: 0.21, paco2: 100, barometricPressure: 400 }));
    expect(error.field).toBe("paco2");
    expect(error.max).toBeCloseTo((0.21 * (400 - 47) - MIN_ALVEOLAR_PO2) * 0.8, 10);
    expect(error.message).toContain("leaves no alveolar oxygen");
  });

  it("refuses a next FiO2 so low that PAO2 would vanish, naming the lowest acceptable one", () => {
    const error = thrown(() =>
      forecastFio2Change({
        fio2: 0.6,
        pao2: 60,
        paco2: 90,
        hemoglobin: 12,
        barometricPressure: 500,
        nextFio2: 0.21,
      }),
    );
    expect(error.field).toBe("nextFio2");
    expect(error.min).toBeCloseTo((MIN_ALVEOLAR_PO2 + 90 / 0.8) / (500 - 47), 10);
    expect(error.max).toBe(1);
  });

  it("refuses a plateau pressure not above PEEP and a peak pressure below the plateau", () => {
    expect(thrown(() => drivingPressure({ plateauPressure: 10, peep: 10 })).field).toBe(
      "plateauPressure",
    );
    const peak = thrown(() =>
      mechanicalPower({
        respiratoryRate: 20,
        tidalVolumeMl: 400,
        peakPressure: 24,
        plateauPressure: 25,
        peep: 10,
      }),
    );
    expect([peak.field, peak.min]).toEqual(["peakPressure", 25]);
  });

  it("states unit-conversion ranges in the caller's unit", () => {
    const error = thrown(() => toGramsPerDecilitre(400, "g/L"));
    expect([error.field, error.max, error.unit]).toEqual(["value", 300, "g/L"]);
  });
});

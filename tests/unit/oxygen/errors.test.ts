import { describe, expect, it } from "vitest";
import { fromEngineError } from "@/lib/errors";
import {
  alveolarPO2,
  cylinderDuration,
  imputePfFromSf,
  OxygenChoiceError,
  rapidShallowBreathingIndex,
  tidalVolumePerKg,
  ventilatoryRatio,
  weaningScreen,
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
    "tidalVolumePerKg",
    "tidalVolumeMl",
    RANGES.tidalVolumeMl,
    (tidalVolumeMl) => tidalVolumePerKg({ tidalVolumeMl, heightCm: 170, sex: "male" }),
  ],
  [
    "tidalVolumePerKg",
    "heightCm",
    RANGES.heightCm,
    (heightCm) => tidalVolumePerKg({ tidalVolumeMl: 400, heightCm, sex: "female" }),
  ],
  [
    "ventilatoryRatio",
    "minuteVentilationLMin",
    RANGES.minuteVentilation,
    (minuteVentilationLMin) =>
      ventilatoryRatio({ minuteVentilationLMin, paco2: 40, predictedBodyWeightKg: 70 }),
  ],
  [
    "ventilatoryRatio",
    "paco2",
    RANGES.paco2,
    (paco2) => ventilatoryRatio({ minuteVentilationLMin: 8, paco2, predictedBodyWeightKg: 70 }),
  ],
  [
    "ventilatoryRatio",
    "predictedBodyWeightKg",
    RANGES.predictedBodyWeight,
    (predictedBodyWeightKg) =>
      ventilatoryRatio({ minuteVentilationLMin: 8, paco2: 40, predictedBodyWeightKg }),
  ],
  [
    "rapidShallowBreathingIndex",
    "respiratoryRate",
    RANGES.respiratoryRate,
    (respiratoryRate) => rapidShallowBreathingIndex({ respiratoryRate, tidalVolumeMl: 400 }),
  ],
  [
    "rapidShallowBreathingIndex",
    "tidalVolumeMl",
    RANGES.tidalVolumeMl,
    (tidalVolumeMl) => rapidShallowBreathingIndex({ respiratoryRate: 20, tidalVolumeMl }),
  ],
  [
    "imputePfFromSf",
    "spo2",
    RANGES.spo2Index,
    (spo2) => imputePfFromSf({ spo2, fio2: 0.5, method: "nonlinear" }),
  ],
  [
    "imputePfFromSf",
    "fio2",
    RANGES.fio2,
    (fio2) => imputePfFromSf({ spo2: 92, fio2, method: "linear" }),
  ],
  [
    "cylinderDuration",
    "flowLMin",
    RANGES.flow,
    (flowLMin) => cylinderDuration({ size: "E", pressure: { value: 2000, unit: "psi" }, flowLMin }),
  ],
  [
    "cylinderDuration",
    "waterCapacityLitres",
    RANGES.cylinderWaterCapacity,
    (waterCapacityLitres) =>
      cylinderDuration({ waterCapacityLitres, pressure: { value: 200, unit: "bar" }, flowLMin: 2 }),
  ],
  ["weaningScreen", "fio2", RANGES.fio2, (fio2) => weaningScreen({ fio2 })],
  ["weaningScreen", "peep", RANGES.peep, (peep) => weaningScreen({ peep })],
  ["weaningScreen", "pf", RANGES.pfRatio, (pf) => weaningScreen({ pf })],
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

describe("OxygenChoiceError", () => {
  it("reads like 'sex must be one of female, male; got \"M\"' and becomes a 400 naming the field", () => {
    let caught: unknown;
    try {
      tidalVolumePerKg({ tidalVolumeMl: 400, heightCm: 170, sex: "M" as "male" });
    } catch (error) {
      caught = error;
    }
    expect(caught).toBeInstanceOf(OxygenChoiceError);
    const error = caught as OxygenChoiceError;
    expect(error.message).toBe('sex must be one of female, male; got "M"');
    expect([error.name, error.field, error.value, error.allowed]).toEqual([
      "OxygenChoiceError",
      "sex",
      "M",
      ["female", "male"],
    ]);
    const domain = fromEngineError(error);
    expect(domain?.status).toBe(400);
    expect(domain?.fieldErrors).toEqual({ sex: [error.message] });
  });
});

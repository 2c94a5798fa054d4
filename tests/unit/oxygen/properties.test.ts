import fc from "fast-check";
import { describe, expect, it } from "vitest";
import {
  alveolarPO2,
  assessBloodGas,
  barometricPressureAtAltitude,
  classifyOxygenation,
  forecastFio2Change,
  mechanicalPower,
  InconsistentBloodGasError,
  OxygenInputError,
  oxygenContent,
  oxygenSaturationIndex,
  po2FromSaturation,
  predictedBodyWeight,
  proposeStep,
  RANGES,
  roxIndex,
  saturationFromPO2,
  staticCompliance,
  toGramsPerDecilitre,
  toMmHg,
  ardsNetworkTable,
  type InputRange,
} from "@/lib/oxygen";

const within = (range: InputRange) => fc.double({ min: range.min, max: range.max, noNaN: true });
const between = (min: number, max: number) => fc.double({ min, max, noNaN: true });

/** Every number anywhere in a result, with its path. */
function numbersIn(value: unknown, path = "result"): Array<[string, number]> {
  if (typeof value === "number") return [[path, value]];
  if (Array.isArray(value))
    return value.flatMap((item, index) => numbersIn(item, `${path}[${index}]`));
  if (value !== null && typeof value === "object") {
    return Object.entries(value).flatMap(([key, item]) => numbersIn(item, `${path}.${key}`));
  }
  return [];
}
const expectAllFinite = (value: unknown) => {
  for (const [path, number] of numbersIn(value)) expect(Number.isFinite(number), path).toBe(true);
};

// A blood gas the engine accepts: PaCO2 kept low enough for the altitude that
// PAO2 stays at or above the lowest PaO2 accepted even on room air, and a
// measured PaO2 no higher than PAO2 at its own FiO2 (above it the inputs
// contradict each other and the forecast is withheld — its own property below).
const bloodGas = between(400, 800).chain((barometricPressure) =>
  fc
    .record({
      fio2: within(RANGES.fio2),
      paco2: between(15, Math.min(120, 0.8 * (0.21 * (barometricPressure - 47) - RANGES.pao2.min))),
      hemoglobin: within(RANGES.hemoglobin),
      barometricPressure: fc.constant(barometricPressure),
    })
    .chain((gas) => {
      const ceiling = Math.min(RANGES.pao2.max, alveolarPO2(gas));
      return between(RANGES.pao2.min, ceiling).map((pao2) => ({ ...gas, pao2 }));
    }),
);

describe("properties", () => {
  it("saturation rises strictly with PO2", () => {
    fc.assert(
      fc.property(between(1, 799), between(0.001, 100), (po2, step) => {
        const higher = Math.min(po2 + step, 800);
        expect(saturationFromPO2(higher)).toBeGreaterThan(saturationFromPO2(po2));
      }),
    );
  });

  it("po2FromSaturation inverts saturationFromPO2", () => {
    fc.assert(
      fc.property(between(1, 600), (po2) => {
        expect(Math.abs(po2FromSaturation(saturationFromPO2(po2)) - po2)).toBeLessThanOrEqual(
          1e-7 * po2,
        );
      }),
    );
  });

  it("every forecast model and the range are non-decreasing in nextFio2", () => {
    fc.assert(
      fc.property(bloodGas, between(0.25, 1), between(0.25, 1), (gas, a, b) => {
        const [lower, higher] = a <= b ? [a, b] : [b, a];
        const low = forecastFio2Change({ ...gas, nextFio2: lower });
        const high = forecastFio2Change({ ...gas, nextFio2: higher });
        for (const key of ["pf", "alveolarArterialRatio", "shunt"] as const) {
          expect(high.models[key].pao2).toBeGreaterThanOrEqual(low.models[key].pao2);
          expect(high.models[key].spo2).toBeGreaterThanOrEqual(low.models[key].spo2);
        }
        expect(high.range.low.pao2).toBeGreaterThanOrEqual(low.range.low.pao2);
        expect(high.range.high.pao2).toBeGreaterThanOrEqual(low.range.high.pao2);
      }),
      { numRuns: 300 },
    );
  });

  it("no forecast model — the shunt model included — exceeds PAO2 at the new FiO2", () => {
    fc.assert(
      fc.property(bloodGas, between(0.25, 1), (gas, nextFio2) => {
        const forecast = forecastFio2Change({ ...gas, nextFio2 });
        const ceiling = alveolarPO2({
          fio2: nextFio2,
          paco2: gas.paco2,
          barometricPressure: gas.barometricPressure,
        });
        expect(forecast.models.shunt.pao2).toBeLessThanOrEqual(ceiling);
        expect(forecast.range.high.pao2).toBeLessThanOrEqual(ceiling);
        expect(forecast.models.shunt.pao2).toBeGreaterThanOrEqual(0);
      }),
      { numRuns: 300 },
    );
  });

  it("no function returns NaN or Infinity over valid inputs", () => {
    fc.assert(
      fc.property(
        bloodGas,
        fc.record({
          spo2: within(RANGES.spo2),
          indexSpo2: within(RANGES.spo2Index),
          sao2: within(RANGES.saturationFraction),
          peep: within(RANGES.peep),
          meanAirwayPressure: within(RANGES.meanAirwayPressure),
          respiratoryRate: within(RANGES.respiratoryRate),
          flow: within(RANGES.flow),
          ageYears: within(RANGES.ageYears),
          cardiacOutput: within(RANGES.cardiacOutput),
          support: fc.constantFrom("none", "conventional", "hfnc", "niv", "invasive" as const),
          nextFio2: between(0.25, 1),
          metres: within(RANGES.altitude),
          heightCm: within(RANGES.heightCm),
          tidalVolumeMl: within(RANGES.tidalVolumeMl),
          plateauPressure: between(31, 60),
          peakPressure: between(60, 80),
        }),
        (gas, extra) => {
          const {
            nextFio2,
            metres,
            heightCm,
            tidalVolumeMl,
            plateauPressure,
            peakPressure,
            indexSpo2,
            ...rest
          } = extra;
          expectAllFinite(assessBloodGas({ ...gas, ...rest }));
          expectAllFinite(forecastFio2Change({ ...gas, nextFio2 }));
          expectAllFinite(classifyOxygenation({ ...gas, ...rest, spo2: indexSpo2 }));
          expectAllFinite(barometricPressureAtAltitude(metres));
          expectAllFinite(predictedBodyWeight({ heightCm, sex: "female" }));
          expectAllFinite(staticCompliance({ tidalVolumeMl, plateauPressure, peep: rest.peep }));
          expectAllFinite(
            mechanicalPower({
              respiratoryRate: rest.respiratoryRate,
              tidalVolumeMl,
              peakPressure,
              plateauPressure,
              peep: rest.peep,
            }),
          );
          expectAllFinite(
            oxygenContent({ hemoglobin: gas.hemoglobin, saturation: rest.sao2, po2: gas.pao2 }),
          );
          expectAllFinite(
            roxIndex({ spo2: indexSpo2, fio2: gas.fio2, respiratoryRate: rest.respiratoryRate }),
          );
          expectAllFinite(
            oxygenSaturationIndex({
              spo2: indexSpo2,
              fio2: gas.fio2,
              meanAirwayPressure: rest.meanAirwayPressure,
            }),
          );
          expectAllFinite(
            proposeStep({
              order: {
                spo2Target: { lower: 88, upper: 95 },
                limits: { fio2Min: 0.21, fio2Max: 1 },
                steps: ardsNetworkTable("higher-peep"),
              },
              current: { fio2: gas.fio2, peep: rest.peep },
              latestReading: { spo2: rest.spo2 },
              latestBloodGas: { ...gas, fio2: gas.fio2 },
              barometricPressure: gas.barometricPressure,
            }),
          );
        },
      ),
      { numRuns: 300 },
    );
  });

  it("withholds every forecast from a PaO2 above PAO2 at its own FiO2, whatever the step", () => {
    fc.assert(
      fc.property(bloodGas, between(1.001, 3), between(0.25, 1), (gas, factor, nextFio2) => {
        const pao2 = alveolarPO2(gas) * factor;
        fc.pre(pao2 <= RANGES.pao2.max);
        expect(() => forecastFio2Change({ ...gas, pao2, nextFio2 })).toThrow(
          InconsistentBloodGasError,
        );
      }),
    );
  });

  const refusals: Array<[string, InputRange, (value: number) => unknown]> = [
    ["fio2", RANGES.fio2, (fio2) => alveolarPO2({ fio2, paco2: 40 })],
    ["po2", RANGES.po2, (po2) => saturationFromPO2(po2)],
    ["so2", RANGES.saturation, (so2) => po2FromSaturation(so2)],
    [
      "hemoglobin",
      RANGES.hemoglobin,
      (hemoglobin) =>
        forecastFio2Change({ fio2: 0.4, pao2: 70, paco2: 40, hemoglobin, nextFio2: 0.5 }),
    ],
    ["pao2", RANGES.pao2, (pao2) => assessBloodGas({ fio2: 0.4, pao2, paco2: 40 })],
    ["spo2", RANGES.spo2Index, (spo2) => classifyOxygenation({ fio2: 0.4, spo2 })],
    ["metres", RANGES.altitude, (metres) => barometricPressureAtAltitude(metres)],
    ["heightCm", RANGES.heightCm, (heightCm) => predictedBodyWeight({ heightCm, sex: "male" })],
    ["value", RANGES.pressureMmHg, (value) => toMmHg(value, "mmHg")],
    ["value", RANGES.hemoglobinGramsPerDecilitre, (value) => toGramsPerDecilitre(value, "g/dL")],
    [
      "latestReading.spo2",
      RANGES.spo2,
      (spo2) =>
        proposeStep({
          order: {
            spo2Target: { lower: 88, upper: 95 },
            limits: { fio2Min: 0.21, fio2Max: 1 },
            steps: [],
          },
          current: { fio2: 0.4 },
          latestReading: { spo2 },
        }),
    ],
  ];

  it("out-of-range and non-finite inputs throw OxygenInputError naming the field", () => {
    const invalid = (range: InputRange) =>
      fc.oneof(
        fc.constantFrom(Number.NaN, Number.POSITIVE_INFINITY, Number.NEGATIVE_INFINITY),
        fc
          .double({ max: range.min, noNaN: true, noDefaultInfinity: true })
          .filter((value) => value < range.min),
        fc
          .double({ min: range.max, noNaN: true, noDefaultInfinity: true })
          .filter((value) => value > range.max),
      );
    fc.assert(
      fc.property(
        fc
          .constantFrom(...refusals)
          .chain(([field, range, call]) =>
            fc.tuple(fc.constant(field), fc.constant(call), invalid(range)),
          ),
        ([field, call, value]) => {
          let caught: unknown;
          try {
            call(value);
          } catch (error) {
            caught = error;
          }
          expect(caught).toBeInstanceOf(OxygenInputError);
          expect((caught as OxygenInputError).field).toBe(field);
        },
      ),
      { numRuns: 500 },
    );
  });
});

import fc from "fast-check";
import { describe, expect, it } from "vitest";
import {
  cylinderDuration,
  type CylinderPressureUnit,
  type CylinderSize,
  imputePfFromSf,
  type InputRange,
  type PfImputationMethod,
  PSI_PER_BAR,
  RANGES,
  rapidShallowBreathingIndex,
  tidalVolumePerKg,
  ventilatoryRatio,
  weaningScreen,
} from "@/lib/oxygen";

const within = (range: InputRange) => fc.double({ min: range.min, max: range.max, noNaN: true });
const between = (min: number, max: number) => fc.double({ min, max, noNaN: true });
const optional = <T>(arbitrary: fc.Arbitrary<T>) =>
  fc.option(arbitrary, { nil: undefined, freq: 3 });

function numbersIn(value: unknown, path = "result"): Array<[string, number]> {
  if (typeof value === "number") return [[path, value]];
  if (Array.isArray(value))
    return value.flatMap((item, index) => numbersIn(item, `${path}[${index}]`));
  if (value !== null && typeof value === "object")
    return Object.entries(value).flatMap(([key, item]) => numbersIn(item, `${path}.${key}`));
  return [];
}
const expectAllFinite = (value: unknown) => {
  for (const [path, number] of numbersIn(value)) expect(Number.isFinite(number), path).toBe(true);
};

const methods = fc.constantFrom<PfImputationMethod>("linear", "nonlinear");
const sizes = fc.constantFrom<CylinderSize>("D", "E", "M", "G", "H", "K");
const units = fc.constantFrom<CylinderPressureUnit>("psi", "bar", "kPa");
const perBar: Record<CylinderPressureUnit, number> = { bar: 1, psi: PSI_PER_BAR, kPa: 100 };
// The reserve is 200 psi unless given; pressures start above it.
const defaultReserveBar = 200 / PSI_PER_BAR;

describe("ventilation, imputation, cylinder and weaning properties", () => {
  it("no function returns NaN or Infinity over valid inputs", () => {
    fc.assert(
      fc.property(
        fc.record({
          heightCm: within(RANGES.heightCm),
          sex: fc.constantFrom("female" as const, "male" as const),
          tidalVolumeMl: within(RANGES.tidalVolumeMl),
          respiratoryRate: within(RANGES.respiratoryRate),
          minuteVentilationLMin: within(RANGES.minuteVentilation),
          paco2: within(RANGES.paco2),
          predictedBodyWeightKg: within(RANGES.predictedBodyWeight),
          spo2: within(RANGES.spo2Index),
          fio2: within(RANGES.fio2),
          method: methods,
          size: sizes,
          unit: units,
          waterCapacityLitres: within(RANGES.cylinderWaterCapacity),
          pressureBar: between(defaultReserveBar * 1.001, RANGES.cylinderPressure.max),
          flowLMin: within(RANGES.flow),
        }),
        (x) => {
          expectAllFinite(tidalVolumePerKg(x));
          expectAllFinite(ventilatoryRatio(x));
          expectAllFinite(rapidShallowBreathingIndex(x));
          expectAllFinite(imputePfFromSf(x));
          const pressure = { value: x.pressureBar * perBar[x.unit], unit: x.unit };
          expectAllFinite(cylinderDuration({ size: x.size, pressure, flowLMin: x.flowLMin }));
          expectAllFinite(
            cylinderDuration({
              waterCapacityLitres: x.waterCapacityLitres,
              pressure,
              reserve: 0,
              flowLMin: x.flowLMin,
            }),
          );
        },
      ),
      { numRuns: 300 },
    );
  });

  it("RSBI rises with the rate and falls with the tidal volume", () => {
    fc.assert(
      fc.property(
        between(2, 79),
        between(50, 1999),
        between(0.01, 10),
        between(0.01, 100),
        (rate, volume, moreRate, moreVolume) => {
          const base = rapidShallowBreathingIndex({ respiratoryRate: rate, tidalVolumeMl: volume });
          const faster = rapidShallowBreathingIndex({
            respiratoryRate: Math.min(rate + moreRate, 80),
            tidalVolumeMl: volume,
          });
          const deeper = rapidShallowBreathingIndex({
            respiratoryRate: rate,
            tidalVolumeMl: Math.min(volume + moreVolume, 2000),
          });
          expect(faster).toBeGreaterThan(base);
          expect(deeper).toBeLessThan(base);
        },
      ),
    );
  });

  it("cylinder minutes fall with the flow and rise with the pressure, by size or by water capacity", () => {
    fc.assert(
      fc.property(
        fc.oneof(
          sizes.map((size) => ({ size })),
          within(RANGES.cylinderWaterCapacity).map((waterCapacityLitres) => ({
            waterCapacityLitres,
          })),
        ),
        units,
        between(defaultReserveBar * 1.001, 299),
        between(0.01, 50),
        between(0.5, 69),
        between(0.01, 10),
        (cylinder, unit, pressureBar, morePressureBar, flowLMin, moreFlow) => {
          const at = (bar: number, flow: number) =>
            cylinderDuration({
              ...cylinder,
              pressure: { value: bar * perBar[unit], unit },
              flowLMin: flow,
            }).minutes;
          const base = at(pressureBar, flowLMin);
          expect(at(pressureBar, Math.min(flowLMin + moreFlow, 70))).toBeLessThan(base);
          expect(at(Math.min(pressureBar + morePressureBar, 300), flowLMin)).toBeGreaterThan(base);
        },
      ),
      { numRuns: 300 },
    );
  });

  it("imputed P/F rises with SpO2 at a fixed FiO2, by either method", () => {
    fc.assert(
      fc.property(
        methods,
        within(RANGES.fio2),
        between(40, 96.99),
        between(0.01, 10),
        (method, fio2, spo2, more) => {
          const lower = imputePfFromSf({ spo2, fio2, method });
          const higher = imputePfFromSf({ spo2: Math.min(spo2 + more, 100), fio2, method });
          fc.pre(lower.valid && higher.valid);
          if (lower.valid && higher.valid) expect(higher.pf).toBeGreaterThan(lower.pf);
        },
      ),
      { numRuns: 300 },
    );
  });

  it("imputed P/F falls as FiO2 rises at a fixed SpO2, by either method", () => {
    fc.assert(
      fc.property(
        methods,
        between(40, 97),
        between(0.21, 0.99),
        between(0.005, 0.5),
        (method, spo2, fio2, more) => {
          const lower = imputePfFromSf({ spo2, fio2, method });
          const higher = imputePfFromSf({ spo2, fio2: Math.min(fio2 + more, 1), method });
          fc.pre(lower.valid && higher.valid);
          if (lower.valid && higher.valid) expect(higher.pf).toBeLessThan(lower.pf);
        },
      ),
      { numRuns: 300 },
    );
  });

  it("an imputation refused always says why and carries no number; an accepted one is positive", () => {
    fc.assert(
      fc.property(methods, within(RANGES.spo2Index), within(RANGES.fio2), (method, spo2, fio2) => {
        const result = imputePfFromSf({ spo2, fio2, method });
        if (result.valid) {
          expect(result.pf).toBeGreaterThan(0);
          expect(result.pao2).toBeGreaterThanOrEqual(RANGES.pao2.min);
        } else {
          expect(result.pf).toBeNull();
          expect(result.reason.length).toBeGreaterThan(20);
        }
      }),
    );
  });

  it("the weaning screen passes exactly when every criterion is recorded and met", () => {
    fc.assert(
      fc.property(
        fc.record({
          fio2: optional(within(RANGES.fio2)),
          peep: optional(within(RANGES.peep)),
          pf: optional(within(RANGES.pfRatio)),
          pfImputed: optional(fc.boolean()),
          respiratoryRate: optional(within(RANGES.respiratoryRate)),
          tidalVolumeMl: optional(within(RANGES.tidalVolumeMl)),
          haemodynamicallyStable: optional(fc.boolean()),
          sedationHeld: optional(fc.boolean()),
          adequateCough: optional(fc.boolean()),
        }),
        (input) => {
          const screen = weaningScreen(input);
          expectAllFinite(screen);
          const every = screen.criteria.every((c) => c.status === "pass");
          expect(screen.overall.pass).toBe(every);
          for (const c of screen.criteria) {
            expect(c.pass).toBe(c.status === "pass");
            if (c.value === null) expect(c.status).toBe("not-recorded");
          }
          if (screen.overall.notRecorded.length > 0) expect(screen.overall.pass).toBe(false);
        },
      ),
      { numRuns: 300 },
    );
  });
});

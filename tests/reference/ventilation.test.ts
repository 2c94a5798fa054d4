import { describe, expect, it } from "vitest";
import {
  drivingPressure,
  mechanicalPower,
  predictedBodyWeight,
  staticCompliance,
  tidalVolumePerKilogram,
} from "@/lib/oxygen";

describe("predictedBodyWeight — ARDS Network, NEJM 2000", () => {
  it.each([
    ["male", 175, 50 + 0.91 * (175 - 152.4)],
    ["female", 160, 45.5 + 0.91 * (160 - 152.4)],
    ["male", 152.4, 50],
    ["female", 152.4, 45.5],
    ["male", 210, 50 + 0.91 * (210 - 152.4)],
    ["female", 130, 45.5 + 0.91 * (130 - 152.4)],
  ] as const)("%s, %s cm → the published formula", (sex, heightCm, expected) => {
    expect(predictedBodyWeight({ heightCm, sex })).toBeCloseTo(expected, 10);
  });

  // The ARDS Network protocol card gives the same equation in inches:
  // 50 (or 45.5) + 2.3 × (height in − 60). Both forms agree within 0.2 kg.
  it.each([
    ["male", 70],
    ["female", 64],
    ["male", 76],
  ] as const)("agrees with the inch form of the protocol card for a %s of %s in", (sex, inches) => {
    const inchForm = (sex === "male" ? 50 : 45.5) + 2.3 * (inches - 60);
    expect(Math.abs(predictedBodyWeight({ heightCm: inches * 2.54, sex }) - inchForm)).toBeLessThan(
      0.2,
    );
  });

  it("gives 6 mL/kg PBW for a 420 mL tidal volume in a 175 cm man (ARMA target; ≈ 70.6 kg)", () => {
    expect(tidalVolumePerKilogram({ tidalVolumeMl: 420, heightCm: 175, sex: "male" })).toBeCloseTo(
      420 / (50 + 0.91 * 22.6),
      10,
    );
    expect(tidalVolumePerKilogram({ tidalVolumeMl: 420, heightCm: 175, sex: "male" })).toBeCloseTo(
      6,
      0,
    );
  });
});

describe("drivingPressure and staticCompliance (Amato et al., NEJM 2015; respiratory mechanics, common practice)", () => {
  it("driving pressure is Pplat − PEEP", () => {
    expect(drivingPressure({ plateauPressure: 27, peep: 12 })).toBe(15);
  });

  it("static compliance is VT / (Pplat − PEEP): 450 mL over 15 cmH2O → 30 mL/cmH2O", () => {
    expect(staticCompliance({ tidalVolumeMl: 450, plateauPressure: 27, peep: 12 })).toBeCloseTo(
      30,
      12,
    );
  });

  it("a healthy passive respiratory system (VT 500 mL, ΔP 8) is in the normal 50–100 mL/cmH2O band (common practice)", () => {
    const value = staticCompliance({ tidalVolumeMl: 500, plateauPressure: 13, peep: 5 });
    expect(value).toBeGreaterThanOrEqual(50);
    expect(value).toBeLessThanOrEqual(100);
  });
});

describe("mechanicalPower — Gattinoni et al., Intensive Care Med 2016, simplified equation", () => {
  it("is 0.098 × RR × VT (L) × (Ppeak − ½ × ΔP)", () => {
    const expected = 0.098 * 20 * 0.5 * (30 - 0.5 * (25 - 10));
    expect(
      mechanicalPower({
        respiratoryRate: 20,
        tidalVolumeMl: 500,
        peakPressure: 30,
        plateauPressure: 25,
        peep: 10,
      }),
    ).toBeCloseTo(expected, 12);
  });

  it("falls in the 10–20 J/min range usually reported for protective ventilation (RR 18, VT 420, Ppeak 28, Pplat 24, PEEP 10; common practice)", () => {
    const value = mechanicalPower({
      respiratoryRate: 18,
      tidalVolumeMl: 420,
      peakPressure: 28,
      plateauPressure: 24,
      peep: 10,
    });
    expect(value).toBeGreaterThan(10);
    expect(value).toBeLessThan(20);
  });
});

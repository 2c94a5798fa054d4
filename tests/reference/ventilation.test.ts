import { describe, expect, it } from "vitest";
import {
  drivingPressure,
  IDEAL_PACO2,
  mechanicalPower,
  OxygenChoiceError,
  OxygenInputError,
  predictedBodyWeight,
  rapidShallowBreathingIndex,
  RSBI_THRESHOLD,
  staticCompliance,
  tidalVolumePerKg,
  toMmHg,
  ventilatoryRatio,
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
    expect(tidalVolumePerKg({ tidalVolumeMl: 420, heightCm: 175, sex: "male" })).toBeCloseTo(
      420 / (50 + 0.91 * 22.6),
      10,
    );
    expect(tidalVolumePerKg({ tidalVolumeMl: 420, heightCm: 175, sex: "male" })).toBeCloseTo(6, 0);
  });
});

describe("tidalVolumePerKg — VT / PBW, PBW by the ARDS Network equation (NEJM 2000)", () => {
  it("gives a 170 cm man a PBW of 66.0 kg (50 + 0.91 × 17.6 = 66.016; the ARDS Network PBW table lists 66 kg at 67 in, 170.2 cm — recalled from memory)", () => {
    expect(predictedBodyWeight({ heightCm: 170, sex: "male" })).toBeCloseTo(66.016, 10);
  });

  it("gives 420 mL in that man 6.36 mL/kg (420 / 66.016 = 6.3621)", () => {
    expect(tidalVolumePerKg({ tidalVolumeMl: 420, heightCm: 170, sex: "male" })).toBeCloseTo(
      6.3621,
      4,
    );
  });

  it("gives 6 mL/kg for 314.5 mL in a 160 cm woman (PBW 45.5 + 0.91 × 7.6 = 52.416; 6 × 52.416 = 314.496)", () => {
    expect(tidalVolumePerKg({ tidalVolumeMl: 314.496, heightCm: 160, sex: "female" })).toBeCloseTo(
      6,
      10,
    );
  });

  it("refuses a sex it does not know instead of taking it for female (engine contract)", () => {
    expect(() =>
      tidalVolumePerKg({ tidalVolumeMl: 420, heightCm: 170, sex: "Male" as "male" }),
    ).toThrow(OxygenChoiceError);
    expect(() => tidalVolumePerKg({ tidalVolumeMl: 20, heightCm: 170, sex: "male" })).toThrow(
      OxygenInputError,
    );
  });
});

describe("ventilatoryRatio — (VE × PaCO2) / (PBW × 100 × 37.5) (Sinha et al., Br J Anaesth 2009; AJRCCM 2019)", () => {
  it("is 1.0 when VE = PBW × 100 mL/min and PaCO2 = 37.5 mmHg (the definition)", () => {
    // 70 kg × 100 mL/min = 7 L/min; (7000 × 37.5) / (70 × 100 × 37.5) = 1
    expect(
      ventilatoryRatio({ minuteVentilationLMin: 7, paco2: 37.5, predictedBodyWeightKg: 70 }),
    ).toBeCloseTo(1, 12);
    // 66.016 kg × 100 mL/min = 6.6016 L/min
    expect(
      ventilatoryRatio({
        minuteVentilationLMin: 6.6016,
        paco2: 37.5,
        predictedBodyWeightKg: 66.016,
      }),
    ).toBeCloseTo(1, 12);
  });

  it("takes the ideal PaCO2 as 37.5 mmHg, Sinha 2009's 5 kPa (5 × 7.50062 = 37.503)", () => {
    expect(IDEAL_PACO2).toBe(37.5);
    expect(toMmHg(5, "kPa")).toBeCloseTo(IDEAL_PACO2, 2);
  });

  it("is 2.02 for VE 10 L/min and PaCO2 50 mmHg in a 66.016 kg PBW (500000 / 247560 = 2.0197)", () => {
    // 10000 × 50 = 500000; 66.016 × 100 × 37.5 = 247560
    expect(
      ventilatoryRatio({ minuteVentilationLMin: 10, paco2: 50, predictedBodyWeightKg: 66.016 }),
    ).toBeCloseTo(2.0197, 4);
  });

  it("takes PaCO2 in mmHg only: 5 typed for 5 kPa is refused (engine contract)", () => {
    expect(() =>
      ventilatoryRatio({ minuteVentilationLMin: 7, paco2: 5, predictedBodyWeightKg: 70 }),
    ).toThrow(OxygenInputError);
    // VE in mL/min typed as L/min
    expect(() =>
      ventilatoryRatio({ minuteVentilationLMin: 7000, paco2: 40, predictedBodyWeightKg: 70 }),
    ).toThrow(OxygenInputError);
  });
});

describe("rapidShallowBreathingIndex — f / VT (L) (Yang & Tobin, NEJM 1991)", () => {
  it("is 100 breaths/min/L at f 30 and VT 300 mL (the definition: 30 / 0.3)", () => {
    expect(rapidShallowBreathingIndex({ respiratoryRate: 30, tidalVolumeMl: 300 })).toBeCloseTo(
      100,
      12,
    );
  });

  it("sits exactly on Yang & Tobin's threshold of 105 at f 21 and VT 200 mL (21 / 0.2)", () => {
    expect(RSBI_THRESHOLD).toBe(105);
    expect(rapidShallowBreathingIndex({ respiratoryRate: 21, tidalVolumeMl: 200 })).toBeCloseTo(
      105,
      12,
    );
  });

  it("is 24 for quiet breathing at f 12 and VT 500 mL (12 / 0.5), far below 105", () => {
    expect(rapidShallowBreathingIndex({ respiratoryRate: 12, tidalVolumeMl: 500 })).toBeCloseTo(
      24,
      12,
    );
  });

  it("refuses a tidal volume typed in litres (0.3 for 300 mL) (engine contract)", () => {
    expect(() => rapidShallowBreathingIndex({ respiratoryRate: 30, tidalVolumeMl: 0.3 })).toThrow(
      OxygenInputError,
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

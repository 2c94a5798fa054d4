import { describe, expect, it } from "vitest";
import {
  barometricPressureAtAltitude,
  dissolvedOxygen,
  oxygenContent,
  oxygenContentParts,
  oxygenDelivery,
  partialPressure,
  saturationFromPO2,
} from "@/lib/oxygen";

describe("oxygenContent — content equation (standard physiology texts; common practice)", () => {
  it("is 1.34 × Hb × SO2 + 0.003 × PO2 mL/dL", () => {
    expect(oxygenContent({ hemoglobin: 15, saturation: 0.98, po2: 100 })).toBeCloseTo(
      1.34 * 15 * 0.98 + 0.003 * 100,
      12,
    );
  });

  it("gives ≈ 20 mL/dL for normal arterial blood (Hb 15, SaO2 97.5 %, PaO2 100; common practice)", () => {
    const value = oxygenContent({ hemoglobin: 15, saturation: 0.975, po2: 100 });
    expect(value).toBeGreaterThan(19.5);
    expect(value).toBeLessThan(20.5);
  });

  it("gives ≈ 15 mL/dL for mixed venous blood (Hb 15, SvO2 75 %, PvO2 40; common practice: a–v difference ≈ 5 mL/dL)", () => {
    const arterial = oxygenContent({ hemoglobin: 15, saturation: 0.975, po2: 100 });
    const venous = oxygenContent({ hemoglobin: 15, saturation: 0.75, po2: 40 });
    expect(venous).toBeGreaterThan(14.5);
    expect(venous).toBeLessThan(15.5);
    expect(arterial - venous).toBeGreaterThan(4.5);
    expect(arterial - venous).toBeLessThan(5.5);
  });

  it("keeps only the dissolved part without haemoglobin saturation (SO2 0)", () => {
    expect(oxygenContent({ hemoglobin: 15, saturation: 0, po2: 600 })).toBeCloseTo(1.8, 12);
  });
});

describe("oxygenDelivery — DO2 = 10 × CO × CaO2 (common practice)", () => {
  it("is ≈ 1000 mL/min at rest (CO 5 L/min, CaO2 20 mL/dL)", () => {
    expect(oxygenDelivery({ cardiacOutput: 5, arterialContent: 20 })).toBeCloseTo(1000, 10);
  });
});

describe("facts of the trade (common practice, no single source)", () => {
  it("dry air at sea level is at 760 mmHg (ICAO standard atmosphere)", () => {
    expect(barometricPressureAtAltitude(0)).toBeCloseTo(760, 1);
  });

  it("O2, about 21 % of dry air, has a partial pressure of about 159–160 mmHg at sea level", () => {
    const po2 = partialPressure({
      fraction: 0.2095,
      totalPressure: barometricPressureAtAltitude(0),
    });
    expect(po2).toBeGreaterThanOrEqual(159);
    expect(po2).toBeLessThanOrEqual(160);
  });

  it("N2 (with the other inert gases, about 79 %) has a partial pressure of about 600 mmHg", () => {
    const pn2 = partialPressure({ fraction: 0.79, totalPressure: 760 });
    expect(pn2).toBeGreaterThan(595);
    expect(pn2).toBeLessThan(605);
  });

  it("the partial pressures of dry air add up to the barometric pressure (Dalton's law)", () => {
    const total = [0.7808, 0.2095, 0.0093, 0.0004].reduce(
      (sum, fraction) => sum + partialPressure({ fraction, totalPressure: 760 }),
      0,
    );
    expect(total).toBeCloseTo(760, 6);
  });

  it("at equilibrium the partial pressure is equal in gas and plasma while the concentrations differ by solubility", () => {
    // Alveolar gas at PO2 100 mmHg and the plasma leaving it share the same PO2.
    const po2 = 100;
    const gasConcentration = (po2 / 760) * 100; // mL O2 per dL of gas (≈ 13 vol %)
    const plasmaConcentration = dissolvedOxygen(po2); // mL O2 per dL of blood
    expect(plasmaConcentration).toBeCloseTo(0.3, 12);
    // The ratio is the inverse of O2's solubility: 0.003 mL/dL/mmHg is a Bunsen
    // coefficient of ≈ 0.023 mL O2 per mL plasma per atmosphere at 37 °C.
    expect(gasConcentration / plasmaConcentration).toBeGreaterThan(40);
    expect(gasConcentration / plasmaConcentration).toBeLessThan(48);
    const bunsen = dissolvedOxygen(760) / 100;
    expect(bunsen).toBeGreaterThan(0.021);
    expect(bunsen).toBeLessThan(0.025);
  });

  it.each([
    [14, 80],
    [15, 90],
    [15, 100],
    [14, 100],
  ])(
    "bound O2 outweighs dissolved about 65–90 times at Hb %s g/dL and PaO2 %s mmHg",
    (hemoglobin, po2) => {
      const { bound, dissolved } = oxygenContentParts({
        hemoglobin,
        saturation: saturationFromPO2(po2),
        po2,
      });
      // Recomputed from the content equation itself:
      expect(bound / dissolved).toBeCloseTo(
        (1.34 * hemoglobin * saturationFromPO2(po2)) / (0.003 * po2),
        10,
      );
      expect(bound / dissolved).toBeGreaterThanOrEqual(60);
      expect(bound / dissolved).toBeLessThanOrEqual(90);
    },
  );

  it("breathing 100 % O2 adds little content once haemoglobin is saturated: dissolved O2 rises ≈ 1.7 mL/dL from PaO2 100 to 663", () => {
    const air = oxygenContentParts({
      hemoglobin: 15,
      saturation: saturationFromPO2(100),
      po2: 100,
    });
    const oxygen = oxygenContentParts({
      hemoglobin: 15,
      saturation: saturationFromPO2(663),
      po2: 663,
    });
    expect(oxygen.dissolved - air.dissolved).toBeCloseTo(0.003 * 563, 10);
    expect(oxygen.bound - air.bound).toBeLessThan(0.5);
  });
});

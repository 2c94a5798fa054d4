import { describe, expect, it } from "vitest";
import { alveolarPO2, barometricPressureAtAltitude, inspiredPO2 } from "@/lib/oxygen";

// 1 mmHg = 133.322387415 Pa (definition of the conventional millimetre of mercury).
const hectopascalsToMmHg = (hPa: number) => (hPa * 100) / 133.322387415;

describe("barometricPressureAtAltitude — ICAO standard atmosphere (ICAO Doc 7488)", () => {
  it("is 1013.25 hPa = 760 mmHg at sea level", () => {
    expect(barometricPressureAtAltitude(0)).toBeCloseTo(760, 2);
  });

  // ICAO Doc 7488 table pressures, recalled from memory; tolerance 0.1 %.
  it.each([
    [1000, 898.76],
    [1500, 845.59],
    [2000, 795.01],
    [3000, 701.21],
    [5000, 540.48],
    [11000, 226.32],
  ])("matches the ICAO table at %s m (%s hPa)", (metres, hPa) => {
    const expected = hectopascalsToMmHg(hPa);
    expect(Math.abs(barometricPressureAtAltitude(metres) - expected) / expected).toBeLessThan(
      0.001,
    );
  });

  it("gives ≈ 634 mmHg at 1500 m and ≈ 526 mmHg at 3000 m (the brief's anchors, from ICAO Doc 7488)", () => {
    expect(barometricPressureAtAltitude(1500)).toBeCloseTo(634, 0);
    expect(barometricPressureAtAltitude(3000)).toBeCloseTo(526, 0);
  });

  it("rises below sea level (Dead Sea shore, about −430 m, ≈ 800 mmHg; common practice)", () => {
    expect(barometricPressureAtAltitude(-430)).toBeGreaterThan(795);
    expect(barometricPressureAtAltitude(-430)).toBeLessThan(805);
  });
});

describe("alveolarPO2 — simplified alveolar gas equation (Fenn, Rahn & Otis 1946)", () => {
  it("gives ≈ 100 mmHg on room air with PaCO2 40 at sea level (0.21 × (760 − 47) − 40/0.8 = 99.7)", () => {
    expect(alveolarPO2({ fio2: 0.21, paco2: 40 })).toBeCloseTo(0.21 * 713 - 50, 10);
    expect(alveolarPO2({ fio2: 0.21, paco2: 40 })).toBeGreaterThan(99);
    expect(alveolarPO2({ fio2: 0.21, paco2: 40 })).toBeLessThan(101);
  });

  it("gives ≈ 663 mmHg on FiO2 1.0 with PaCO2 40 at sea level (713 − 50)", () => {
    expect(alveolarPO2({ fio2: 1, paco2: 40 })).toBeCloseTo(663, 10);
  });

  it("falls with hypoventilation: each 1 mmHg of PaCO2 costs 1/R = 1.25 mmHg of PAO2", () => {
    const normal = alveolarPO2({ fio2: 0.21, paco2: 40 });
    const hypoventilating = alveolarPO2({ fio2: 0.21, paco2: 60 });
    expect(normal - hypoventilating).toBeCloseTo(25, 10);
  });

  it("uses the stated barometric pressure, water vapour pressure and R", () => {
    const pb = barometricPressureAtAltitude(3000);
    expect(
      alveolarPO2({
        fio2: 0.21,
        paco2: 35,
        barometricPressure: pb,
        waterVapourPressure: 47,
        respiratoryQuotient: 1,
      }),
    ).toBeCloseTo(0.21 * (pb - 47) - 35, 10);
  });

  it("gives ≈ 60 mmHg on room air at 3000 m with PaCO2 35 (altitude physiology, common practice)", () => {
    const value = alveolarPO2({
      fio2: 0.21,
      paco2: 35,
      barometricPressure: barometricPressureAtAltitude(3000),
    });
    expect(value).toBeGreaterThan(55);
    expect(value).toBeLessThan(62);
  });

  it("humidified inspired PO2 on room air at sea level is ≈ 150 mmHg (0.21 × 713; common practice)", () => {
    expect(inspiredPO2({ fio2: 0.21 })).toBeCloseTo(149.73, 2);
  });
});

import { describe, expect, it } from "vitest";
import {
  CYLINDER_FACTORS,
  cylinderDuration,
  type CylinderSize,
  OxygenChoiceError,
  OxygenInputError,
} from "@/lib/oxygen";

// Cylinder arithmetic is common practice rather than one published source: the
// US cylinder factors (L/psi), the 200 psi reserve and water capacity ×
// pressure in bar for the litres a cylinder holds (ideal gas). Every expected
// value is worked out by hand beside the check.

function thrown(call: () => unknown): Error {
  try {
    call();
  } catch (error) {
    if (error instanceof Error) return error;
  }
  throw new Error("expected an error");
}

describe("cylinderDuration by US size — (pressure − reserve) × factor ÷ flow (common practice)", () => {
  it("uses the common factors D 0.16, E 0.28, M 1.56, G 2.41, H and K 3.14 L/psi", () => {
    expect(CYLINDER_FACTORS).toEqual({ D: 0.16, E: 0.28, M: 1.56, G: 2.41, H: 3.14, K: 3.14 });
  });

  it("gives a full E cylinder (2000 psi) 252 min at 2 L/min above the 200 psi reserve", () => {
    // (2000 − 200) × 0.28 = 504 L; 504 / 2 = 252 min
    const result = cylinderDuration({
      size: "E",
      pressure: { value: 2000, unit: "psi" },
      flowLMin: 2,
    });
    expect(result.litresAvailable).toBeCloseTo(504, 10);
    expect(result.minutes).toBeCloseTo(252, 10);
    expect(result.reserve).toEqual({ value: 200, unit: "psi", assumed: true });
  });

  it.each([
    // size, psi, L/min, minutes: (psi − 200) × factor / flow
    ["D", 2000, 2, 144], // 1800 × 0.16 / 2
    ["E", 1000, 4, 56], // 800 × 0.28 / 4
    ["M", 2200, 10, 312], // 2000 × 1.56 / 10
    ["G", 2200, 15, 321.333], // 2000 × 2.41 / 15
    ["H", 2200, 10, 628], // 2000 × 3.14 / 10
    ["K", 2200, 10, 628],
  ] as const)("%s cylinder at %s psi and %s L/min lasts %s min", (size, psi, flow, minutes) => {
    const result = cylinderDuration({
      size: size as CylinderSize,
      pressure: { value: psi, unit: "psi" },
      flowLMin: flow,
    });
    expect(result.minutes).toBeCloseTo(minutes, 3);
  });

  it("uses the reserve given instead: an E cylinder at 2000 psi with none kept is 560 L, 280 min at 2 L/min", () => {
    // 2000 × 0.28 = 560 L; 560 / 2 = 280 min
    const result = cylinderDuration({
      size: "E",
      pressure: { value: 2000, unit: "psi" },
      reserve: 0,
      flowLMin: 2,
    });
    expect(result.minutes).toBeCloseTo(280, 10);
    expect(result.reserve.assumed).toBe(false);
  });

  it("gives the same answer for the same gauge reading in bar or kPa (1 bar = 14.5038 psi = 100 kPa)", () => {
    // 2000 psi = 137.895 bar = 13789.5 kPa; the default reserve follows the unit
    const bar = cylinderDuration({
      size: "E",
      pressure: { value: 2000 / 14.5037738, unit: "bar" },
      flowLMin: 2,
    });
    const kPa = cylinderDuration({
      size: "E",
      pressure: { value: (2000 / 14.5037738) * 100, unit: "kPa" },
      flowLMin: 2,
    });
    expect(bar.minutes).toBeCloseTo(252, 8);
    expect(kPa.minutes).toBeCloseTo(252, 8);
    // 200 psi = 13.79 bar
    expect(bar.reserve.value).toBeCloseTo(13.7895, 4);
  });
});

describe("cylinderDuration by water capacity — litres = capacity × pressure (bar), ideal gas (common practice)", () => {
  it("holds 2000 L in a 10 L cylinder at 200 bar with no reserve: 133.3 min at 15 L/min", () => {
    // 10 × 200 = 2000 L; 2000 / 15 = 133.333 min
    const result = cylinderDuration({
      waterCapacityLitres: 10,
      pressure: { value: 200, unit: "bar" },
      reserve: 0,
      flowLMin: 15,
    });
    expect(result.litresAvailable).toBeCloseTo(2000, 10);
    expect(result.minutes).toBeCloseTo(133.333, 3);
  });

  it("keeps the default reserve of 200 psi (13.79 bar): 1862 L, 124.1 min", () => {
    // 10 × (200 − 13.7895) = 1862.105 L; / 15 = 124.140 min
    const result = cylinderDuration({
      waterCapacityLitres: 10,
      pressure: { value: 200, unit: "bar" },
      flowLMin: 15,
    });
    expect(result.litresAvailable).toBeCloseTo(1862.105, 3);
    expect(result.minutes).toBeCloseTo(124.14, 2);
  });

  it("reads a 2 L cylinder at 137 bar with a 10 bar reserve as 254 L: 42.3 min at 6 L/min", () => {
    // 2 × (137 − 10) = 254 L; 254 / 6 = 42.333 min; in kPa the same
    const bar = cylinderDuration({
      waterCapacityLitres: 2,
      pressure: { value: 137, unit: "bar" },
      reserve: 10,
      flowLMin: 6,
    });
    const kPa = cylinderDuration({
      waterCapacityLitres: 2,
      pressure: { value: 13700, unit: "kPa" },
      reserve: 1000,
      flowLMin: 6,
    });
    expect(bar.litresAvailable).toBeCloseTo(254, 10);
    expect(kPa.minutes).toBeCloseTo(42.333, 3);
  });
});

describe("cylinderDuration refuses what cannot be (engine contract)", () => {
  it("refuses a pressure at or below the reserve, naming the pressure and the reserve", () => {
    const at = thrown(() =>
      cylinderDuration({ size: "E", pressure: { value: 200, unit: "psi" }, flowLMin: 2 }),
    );
    expect(at).toBeInstanceOf(OxygenInputError);
    expect((at as OxygenInputError).field).toBe("pressure.value");
    expect((at as OxygenInputError).min).toBe(200);
    expect(at.message).toMatch(/must exceed the reserve/);
    expect(() =>
      cylinderDuration({
        waterCapacityLitres: 10,
        pressure: { value: 5, unit: "bar" },
        reserve: 10,
        flowLMin: 2,
      }),
    ).toThrow(OxygenInputError);
  });

  it("refuses a flow of 0 or below, and above 70 L/min", () => {
    for (const flowLMin of [0, -2, 71, Number.POSITIVE_INFINITY]) {
      const error = thrown(() =>
        cylinderDuration({ size: "E", pressure: { value: 2000, unit: "psi" }, flowLMin }),
      );
      expect((error as OxygenInputError).field).toBe("flowLMin");
    }
  });

  it("refuses a pressure above 300 bar, stated in the caller's unit (4351 psi)", () => {
    const error = thrown(() =>
      cylinderDuration({ size: "E", pressure: { value: 5000, unit: "psi" }, flowLMin: 2 }),
    ) as OxygenInputError;
    expect(error.field).toBe("pressure.value");
    expect(error.unit).toBe("psi");
    expect(error.max).toBeCloseTo(300 * 14.5037738, 6);
  });

  it("refuses an unknown size, an unknown unit, and both or neither of size and water capacity", () => {
    const size = thrown(() =>
      cylinderDuration({
        size: "Q" as CylinderSize,
        pressure: { value: 2000, unit: "psi" },
        flowLMin: 2,
      }),
    );
    expect(size).toBeInstanceOf(OxygenChoiceError);
    expect((size as OxygenChoiceError).field).toBe("size");
    const unit = thrown(() =>
      cylinderDuration({
        size: "E",
        pressure: { value: 2000, unit: "atm" as "psi" },
        flowLMin: 2,
      }),
    );
    expect((unit as OxygenChoiceError).field).toBe("pressure.unit");
    for (const cylinder of [{ size: "E" as const, waterCapacityLitres: 4.7 }, {}]) {
      const error = thrown(() =>
        cylinderDuration({ ...cylinder, pressure: { value: 2000, unit: "psi" }, flowLMin: 2 }),
      );
      expect(error).toBeInstanceOf(OxygenChoiceError);
      expect((error as OxygenChoiceError).field).toBe("cylinder");
    }
  });

  it("refuses a water capacity outside 0.5–50 L", () => {
    for (const waterCapacityLitres of [0, 0.4, 51, Number.NaN]) {
      const error = thrown(() =>
        cylinderDuration({
          waterCapacityLitres,
          pressure: { value: 200, unit: "bar" },
          flowLMin: 2,
        }),
      );
      expect((error as OxygenInputError).field).toBe("waterCapacityLitres");
    }
  });
});

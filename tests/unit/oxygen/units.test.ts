import { describe, expect, it } from "vitest";
import { convertToStored } from "@/lib/imports/units";
import {
  convertPressure,
  formatPressure,
  fromGramsPerDecilitre,
  fromMmHg,
  type HemoglobinUnit,
  type PressureUnit,
  RANGES,
  restatePressureRange,
  toGramsPerDecilitre,
  toMmHg,
} from "@/lib/oxygen";

describe("units", () => {
  it.each(["mmHg", "kPa"] as const satisfies readonly PressureUnit[])(
    "round-trips pressures through %s",
    (unit) => {
      for (const mmHg of [0, 5, 40, 100, 760])
        expect(toMmHg(fromMmHg(mmHg, unit), unit)).toBeCloseTo(mmHg, 10);
    },
  );

  it.each(["g/dL", "g/L", "mmol/L"] as const satisfies readonly HemoglobinUnit[])(
    "round-trips haemoglobin through %s",
    (unit) => {
      for (const gramsPerDecilitre of [0, 7, 12.5, 20]) {
        expect(
          toGramsPerDecilitre(fromGramsPerDecilitre(gramsPerDecilitre, unit), unit),
        ).toBeCloseTo(gramsPerDecilitre, 10);
      }
    },
  );

  it("uses 1 kPa = 7.50062 mmHg", () => {
    expect(toMmHg(1, "kPa")).toBe(7.50062);
    expect(toMmHg(8, "kPa")).toBeCloseTo(60.00496, 10);
  });

  it("formats whole mmHg and one-decimal kPa by default, other precisions on request", () => {
    expect(formatPressure(75.4, "mmHg")).toBe("75 mmHg");
    expect(formatPressure(75, "kPa")).toBe(`${(75 / 7.50062).toFixed(1)} kPa`);
    expect(formatPressure(40, "kPa", 2)).toBe(`${(40 / 7.50062).toFixed(2)} kPa`);
    expect(() => formatPressure(40, "kPa", 12)).toThrow(/digits/);
  });

  it("converts at one edge: a value typed in a form and the same value imported are stored alike", () => {
    for (const kPa of [1.3, 8, 13.3, 60]) {
      const imported = convertToStored("pao2", kPa, "kPa");
      expect(imported.ok && imported.value).toBe(toMmHg(kPa, "kPa"));
    }
    for (const mmol of [2, 7.5, 15]) {
      const imported = convertToStored("hemoglobin", mmol, "mmol/L");
      expect(imported.ok && imported.value).toBe(toGramsPerDecilitre(mmol, "mmol/L"));
    }
    // Gradients and axis ends are converted without the range check.
    expect(convertPressure(-15, "mmHg", "kPa")).toBeCloseTo(-15 / 7.50062, 10);
  });

  it("restates a mmHg range in kPa rounded inward, so every value it allows converts back inside", () => {
    const kPa = restatePressureRange(RANGES.pao2Target, "kPa", 1);
    expect(kPa).toEqual({ min: 5.4, max: 39.9, unit: "kPa" });
    expect(toMmHg(kPa.min, "kPa")).toBeGreaterThanOrEqual(RANGES.pao2Target.min);
    expect(toMmHg(kPa.max, "kPa")).toBeLessThanOrEqual(RANGES.pao2Target.max);
    expect(restatePressureRange(RANGES.pao2, "mmHg")).toBe(RANGES.pao2);
  });
});

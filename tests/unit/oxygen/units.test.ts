import { describe, expect, it } from "vitest";
import { formatPressure, fromGramsPerDecilitre, fromMmHg, type HemoglobinUnit, type PressureUnit, toGramsPerDecilitre, toMmHg } from "@/lib/oxygen";

describe("units", () => {
  it.each(["mmHg", "kPa"] as const satisfies readonly PressureUnit[])("round-trips pressures through %s", (unit) => {
    for (const mmHg of [0, 5, 40, 100, 760]) expect(toMmHg(fromMmHg(mmHg, unit), unit)).toBeCloseTo(mmHg, 10);
  });

  it.each(["g/dL", "g/L", "mmol/L"] as const satisfies readonly HemoglobinUnit[])("round-trips haemoglobin through %s", (unit) => {
    for (const gramsPerDecilitre of [0, 7, 12.5, 20]) {
      expect(toGramsPerDecilitre(fromGramsPerDecilitre(gramsPerDecilitre, unit), unit)).toBeCloseTo(gramsPerDecilitre, 10);
    }
  });

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
});

import { createRequire } from "node:module";
import { describe, expect, it } from "vitest";
import {
  formatPressure,
  fromGramsPerDecilitre,
  fromMmHg,
  HEMOGLOBIN_MONOMER_MOLAR_MASS,
  toGramsPerDecilitre,
  toMmHg,
} from "@/lib/oxygen";

// Cross-check against the NLM's UCUM implementation (@lhncbc/ucum-lhc), whose
// definitions come from the UCUM specification, not from the engine's constants.
// The package ships no types; this is the part of its API used here
// (UcumLhcUtils.convertUnitTo, checked in source/ucumLhcUtils.js).
interface UcumConversion {
  status: "succeeded" | "failed" | "error";
  toVal: number | null;
  msg: string[];
}
interface UcumPackage {
  UcumLhcUtils: {
    getInstance(): {
      convertUnitTo(
        from: string,
        value: number,
        to: string,
        options?: { molecularWeight?: number },
      ): UcumConversion;
    };
  };
}
const ucum = createRequire(import.meta.url)("@lhncbc/ucum-lhc") as UcumPackage;
const utils = ucum.UcumLhcUtils.getInstance();

function convert(from: string, value: number, to: string, molecularWeight?: number): number {
  const result = utils.convertUnitTo(
    from,
    value,
    to,
    molecularWeight === undefined ? {} : { molecularWeight },
  );
  if (result.status !== "succeeded" || result.toVal === null)
    throw new Error(`UCUM: ${result.msg.join("; ")}`);
  return result.toVal;
}

// UCUM defines mm[Hg] as 0.133322 kPa (six digits), so agreement is to about 1e-5.
const RELATIVE = 1e-5;
const close = (actual: number, expected: number) =>
  expect(Math.abs(actual - expected) / Math.abs(expected)).toBeLessThan(RELATIVE);

describe("pressure units against UCUM (mm[Hg], kPa)", () => {
  it.each([1, 7.5, 40, 100, 760])("%s mmHg in kPa", (mmHg) => {
    close(fromMmHg(mmHg, "kPa"), convert("mm[Hg]", mmHg, "kPa"));
  });

  it.each([0.5, 5.3, 13.3, 101.325])("%s kPa in mmHg", (kPa) => {
    close(toMmHg(kPa, "kPa"), convert("kPa", kPa, "mm[Hg]"));
  });

  it("one standard atmosphere is 760 mmHg (UCUM atm)", () => {
    close(toMmHg(convert("atm", 1, "kPa"), "kPa"), 760);
  });

  it("formats with the unit beside the value", () => {
    expect(formatPressure(100, "mmHg")).toBe("100 mmHg");
    expect(formatPressure(100, "kPa")).toBe(`${convert("mm[Hg]", 100, "kPa").toFixed(1)} kPa`);
  });
});

describe("haemoglobin units against UCUM (g/dL, g/L, mmol/L)", () => {
  it.each([5, 12, 15.5])("%s g/dL in g/L", (gramsPerDecilitre) => {
    close(
      fromGramsPerDecilitre(gramsPerDecilitre, "g/L"),
      convert("g/dL", gramsPerDecilitre, "g/L"),
    );
    close(toGramsPerDecilitre(convert("g/dL", gramsPerDecilitre, "g/L"), "g/L"), gramsPerDecilitre);
  });

  // mmol/L is reported per haemoglobin monomer (one haem); UCUM needs that
  // molar mass to convert mass to amount.
  it.each([5, 12, 15.5])("%s g/dL in mmol/L (monomer basis)", (gramsPerDecilitre) => {
    const expected = convert("g/dL", gramsPerDecilitre, "mmol/L", HEMOGLOBIN_MONOMER_MOLAR_MASS);
    close(fromGramsPerDecilitre(gramsPerDecilitre, "mmol/L"), expected);
    close(toGramsPerDecilitre(expected, "mmol/L"), gramsPerDecilitre);
  });

  it("1 g/dL is 0.6206 mmol/L, the factor laboratories print (monomer, 16,114.5 g/mol)", () => {
    expect(fromGramsPerDecilitre(1, "mmol/L")).toBeCloseTo(0.6206, 4);
    expect(convert("g/dL", 1, "mmol/L", 16114.5)).toBeCloseTo(0.6206, 4);
  });
});

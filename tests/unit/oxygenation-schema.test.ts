import { describe, expect, it } from "vitest";
import { alveolarPO2, OxygenInputError, RANGES } from "@/lib/oxygen";
import { describeInputError } from "@/lib/oxygenation/messages";
import {
  assessFormSchema,
  assessRequestFromForm,
  assessRequestSchema,
  forecastRequestSchema,
  hemoglobinRangeIn,
  pressureRangeIn,
  rangeMessage,
} from "@/lib/oxygenation/schema";
import { toFieldErrors } from "@/lib/validation";

// Published conversion factors, written out here rather than taken from the engine:
// - 1 mmHg = 13 595.1 kg/m³ × 9.80665 m/s² × 0.001 m = 133.322387415 Pa (the
//   conventional millimetre of mercury; NIST SP 811 appendix B.8 lists 1.333 224 E+02 Pa),
//   so 1 kPa = 1000 / 133.322387415 mmHg.
// - 1 g/dL = 10 g/L (1 dL = 0.1 L, SI definition of the litre's prefixes).
// - 1 g/dL haemoglobin = 0.6206 mmol/L, counting the monomer Hb(Fe) of 16 114.5 g/mol
//   (recalled from memory: the factor printed in clinical SI conversion tables,
//   e.g. the AMA Manual of Style's; 8 mmol/L ≈ 12.9 g/dL).
const MMHG_PER_KPA_PUBLISHED = 1000 / 133.322387415;
const MMOL_PER_L_PER_G_PER_DL_PUBLISHED = 0.6206;

function fieldErrorsOf(schema: { safeParse: typeof assessRequestSchema.safeParse }, body: unknown) {
  const result = schema.safeParse(body);
  if (result.success) throw new Error(`expected a refusal, got ${JSON.stringify(result.data)}`);
  return toFieldErrors(result.error);
}

const valid = { fio2: 0.4, pao2: 80, paco2: 40 };

describe("assess request: units", () => {
  it("converts PaO2, PaCO2 and barometric pressure typed in kPa to mmHg", () => {
    const parsed = assessRequestSchema.parse({
      pressureUnit: "kPa",
      fio2: 0.4,
      pao2: 10,
      paco2: 5.3,
      barometricPressure: 101.325,
    });
    const relative = (actual: number, expected: number) => Math.abs(actual - expected) / expected;
    expect(relative(parsed.input.pao2, 10 * MMHG_PER_KPA_PUBLISHED)).toBeLessThan(1e-6);
    // 5.3 kPa is the usual normal PaCO2, about 40 mmHg (common practice).
    expect(relative(parsed.input.paco2, 5.3 * MMHG_PER_KPA_PUBLISHED)).toBeLessThan(1e-6);
    expect(parsed.input.paco2).toBeCloseTo(39.75, 2);
    // One standard atmosphere, 101.325 kPa, is 760 mmHg (by definition of the atmosphere).
    expect(parsed.input.barometricPressure).toBeCloseTo(760, 2);
    expect(parsed.pressureUnit).toBe("kPa");
  });

  it("takes mmHg and g/dL when no unit is given", () => {
    const parsed = assessRequestSchema.parse({ ...valid, hemoglobin: 12 });
    expect(parsed.input).toMatchObject({ fio2: 0.4, pao2: 80, paco2: 40, hemoglobin: 12 });
    expect(parsed).toMatchObject({ pressureUnit: "mmHg", hemoglobinUnit: "g/dL" });
  });

  it("converts haemoglobin from g/L and mmol/L to g/dL", () => {
    const inGramsPerLitre = assessRequestSchema.parse({
      ...valid,
      hemoglobin: 120,
      hemoglobinUnit: "g/L",
    });
    expect(inGramsPerLitre.input.hemoglobin).toBeCloseTo(12, 10);
    const inMillimoles = assessRequestSchema.parse({
      ...valid,
      hemoglobin: 8,
      hemoglobinUnit: "mmol/L",
    });
    // The published factor has four significant digits: agreement to 1 part in 10 000.
    const expected = 8 / MMOL_PER_L_PER_G_PER_DL_PUBLISHED;
    expect(Math.abs((inMillimoles.input.hemoglobin ?? 0) - expected) / expected).toBeLessThan(1e-4);
    expect(inMillimoles.input.hemoglobin).toBeCloseTo(12.89, 2);
  });

  it("takes SaO2 in % and gives the engine a fraction; leaves out what was not given", () => {
    const parsed = assessRequestSchema.parse({ ...valid, sao2: 95.5, spo2: 94 });
    expect(parsed.input.sao2).toBeCloseTo(0.955, 10);
    expect(parsed.input.spo2).toBe(94);
    expect(Object.keys(parsed.input)).not.toContain("hemoglobin");
  });
});

describe("assess request: refusals name the field and the range in the unit typed", () => {
  it("states the PaO2 range in kPa when kPa was typed", () => {
    const errors = fieldErrorsOf(assessRequestSchema, {
      ...valid,
      pressureUnit: "kPa",
      pao2: 100,
      paco2: 5.3,
    });
    // 10–700 mmHg is 1.333…–93.326… kPa; rounded inward so every allowed value is accepted.
    expect(errors.pao2).toEqual(["PaO2 must be between 1.34 and 93.32 kPa."]);
  });

  it("states the PaO2 range in mmHg when mmHg was typed", () => {
    const errors = fieldErrorsOf(assessRequestSchema, { ...valid, pao2: 5 });
    expect(errors.pao2).toEqual([rangeMessage("PaO2", RANGES.pao2.min, RANGES.pao2.max, "mmHg")]);
    expect(errors.pao2).toEqual(["PaO2 must be between 10 and 700 mmHg."]);
  });

  it("accepts the bounds it states and refuses just outside them", () => {
    const { min, max } = pressureRangeIn("pao2", "kPa");
    for (const pao2 of [min, max]) {
      const parsed = assessRequestSchema.parse({ ...valid, pressureUnit: "kPa", paco2: 5.3, pao2 });
      expect(parsed.input.pao2).toBeGreaterThanOrEqual(RANGES.pao2.min);
      expect(parsed.input.pao2).toBeLessThanOrEqual(RANGES.pao2.max);
    }
    expect(
      fieldErrorsOf(assessRequestSchema, {
        ...valid,
        pressureUnit: "kPa",
        paco2: 5.3,
        pao2: min - 0.01,
      }).pao2,
    ).toBeDefined();
    expect(
      fieldErrorsOf(assessRequestSchema, {
        ...valid,
        pressureUnit: "kPa",
        paco2: 5.3,
        pao2: max + 0.01,
      }).pao2,
    ).toBeDefined();
  });

  it("states haemoglobin ranges in g/L and mmol/L", () => {
    expect(
      fieldErrorsOf(assessRequestSchema, { ...valid, hemoglobin: 12, hemoglobinUnit: "g/L" })
        .hemoglobin,
    ).toEqual(["Haemoglobin must be between 30 and 250 g/L."]);
    const mmol = hemoglobinRangeIn("mmol/L");
    // 3–25 g/dL × 0.6206 = 1.86–15.52 mmol/L, rounded inward.
    expect(mmol.min).toBeCloseTo(1.87, 10);
    expect(mmol.max).toBeCloseTo(15.51, 10);
    expect(
      fieldErrorsOf(assessRequestSchema, { ...valid, hemoglobin: 20, hemoglobinUnit: "mmol/L" })
        .hemoglobin,
    ).toEqual(["Haemoglobin must be between 1.87 and 15.51 mmol/L."]);
  });

  it("refuses FiO2 typed as a percentage, saying it is a fraction", () => {
    expect(fieldErrorsOf(assessRequestSchema, { ...valid, fio2: 40 }).fio2).toEqual([
      "FiO2 must be between 0.21 and 1 (a fraction: 0.4 for 40 %).",
    ]);
  });

  it("names every refused field at once, including missing and non-numeric ones", () => {
    const errors = fieldErrorsOf(assessRequestSchema, {
      pressureUnit: "kPa",
      pao2: "high",
      paco2: 30,
      spo2: 130,
    });
    expect(errors.fio2).toEqual(["Enter FiO2."]);
    expect(errors.pao2).toEqual(["PaO2 must be a number."]);
    expect(errors.paco2).toEqual(["PaCO2 must be between 1.34 and 19.99 kPa."]);
    expect(errors.spo2).toEqual(["SpO2 must be between 0 and 100 %."]);
  });

  it("refuses an unknown unit and unknown keys", () => {
    expect(
      fieldErrorsOf(assessRequestSchema, { ...valid, pressureUnit: "torr" }).pressureUnit,
    ).toEqual(["Pressure unit must be mmHg or kPa."]);
    expect(fieldErrorsOf(assessRequestSchema, { ...valid, age: 70 })._form?.[0]).toMatch(/age/);
  });
});

describe("the blood-gas form", () => {
  it("takes FiO2 as a percentage and posts the fraction", () => {
    const values = assessFormSchema.parse({ fio2Percent: 40, pao2: 80, paco2: 40 });
    const body = assessRequestFromForm(values, { unitId: 1, ageYears: 67 });
    expect(body).toMatchObject({ fio2: 0.4, pao2: 80, paco2: 40, unitId: 1, ageYears: 67 });
    expect(body).not.toHaveProperty("fio2Percent");
    expect(assessRequestSchema.safeParse(body).success).toBe(true);
  });

  it("refuses a FiO2 percentage outside 21–100 % in the words of the form", () => {
    const result = assessFormSchema.safeParse({ fio2Percent: 0.4, pao2: 80, paco2: 40 });
    expect(result.success).toBe(false);
    if (!result.success)
      expect(toFieldErrors(result.error).fio2Percent).toEqual([
        "FiO2 must be between 21 and 100 %.",
      ]);
  });

  it("leaves out an age the engine's age rule does not cover", () => {
    const values = assessFormSchema.parse({ fio2Percent: 40, pao2: 80, paco2: 40 });
    expect(assessRequestFromForm(values, { ageYears: 16 })).not.toHaveProperty("ageYears");
  });
});

describe("forecast request", () => {
  it("converts units and requires haemoglobin and a proposed FiO2 fraction", () => {
    const parsed = forecastRequestSchema.parse({
      pressureUnit: "kPa",
      hemoglobinUnit: "g/L",
      fio2: 0.5,
      pao2: 10,
      paco2: 5.3,
      hemoglobin: 110,
      nextFio2: 0.4,
    });
    expect(parsed.input.pao2).toBeCloseTo(10 * MMHG_PER_KPA_PUBLISHED, 3);
    expect(parsed.input.hemoglobin).toBeCloseTo(11, 10);
    const errors = fieldErrorsOf(forecastRequestSchema, {
      fio2: 0.5,
      pao2: 70,
      paco2: 40,
      nextFio2: 140,
    });
    expect(errors.hemoglobin).toEqual(["Enter Haemoglobin."]);
    expect(errors.nextFio2).toEqual([
      "Proposed FiO2 must be between 0.21 and 1 (a fraction: 0.4 for 40 %).",
    ]);
  });
});

describe("engine refusals re-stated for the caller", () => {
  it("gives a PaCO2 too high for the FiO2 in the unit typed, with the engine's reason", () => {
    let error: unknown;
    try {
      // On room air at sea level, PaCO2 above (149.7 − 1) × 0.8 ≈ 119 mmHg leaves no alveolar O2.
      alveolarPO2({ fio2: 0.21, paco2: 140 });
    } catch (thrown) {
      error = thrown;
    }
    expect(error).toBeInstanceOf(OxygenInputError);
    const inKpa = describeInputError(error as OxygenInputError, {
      pressureUnit: "kPa",
      hemoglobinUnit: "g/dL",
    });
    expect(inKpa.field).toBe("paco2");
    expect(inKpa.message).toMatch(
      /^PaCO2 must be between 1\.34 and 15\.86 kPa: .*leaves no alveolar oxygen\.$/,
    );
    const inMmHg = describeInputError(error as OxygenInputError, {
      pressureUnit: "mmHg",
      hemoglobinUnit: "g/dL",
    });
    expect(inMmHg.message).toMatch(/^PaCO2 must be between 10 and 118 mmHg: /);
  });
});

import { otherPressureUnit } from "../blood-gases/pressure-hint";
import { UcumLhcUtils } from "@lhncbc/ucum-lhc";
import {
  convertHemoglobin,
  convertPressure,
  type HemoglobinUnit,
  type PressureUnit,
  RANGES,
} from "../oxygen";
import {
  MEASURED_FIELDS,
  UNIT_LABELS,
  type MeasuredField,
  type RowReason,
  type UcumCode,
} from "./kinds";

// Unit conversion of imported values. Pressures and haemoglobin go through the
// same edge as the forms (lib/oxygen/units.ts), so a value typed and the same
// value imported are stored alike; that edge's factors are checked against the
// UCUM standard in tests/reference/units-ucum.test.ts. Percentages and
// fractions go through the NLM's UCUM implementation.

const ucum = UcumLhcUtils.getInstance();

const PRESSURE_UNITS: Partial<Record<UcumCode, PressureUnit>> = { "mm[Hg]": "mmHg", kPa: "kPa" };
const HEMOGLOBIN_UNITS: Partial<Record<UcumCode, HemoglobinUnit>> = {
  "g/dL": "g/dL",
  "g/L": "g/L",
  "mmol/L": "mmol/L",
};

/** Spellings analysers send that are not UCUM codes, mapped to the code meant. */
const UNIT_ALIASES: Record<string, UcumCode> = {
  mmhg: "mm[Hg]",
  "mm hg": "mm[Hg]",
  "mm[hg]": "mm[Hg]",
  kpa: "kPa",
  "g/dl": "g/dL",
  "g/l": "g/L",
  "mmol/l": "mmol/L",
  // HCO3- and base excess are monovalent: 1 mEq/L = 1 mmol/L.
  "meq/l": "mmol/L",
  "%": "%",
  pct: "%",
  "1": "1",
  "{ratio}": "1",
  fraction: "1",
  ph: "[pH]",
  "[ph]": "[pH]",
};

/** The UCUM code a unit text stands for, or undefined if it is not one Tidemark knows. */
export function normalizeUnit(text: string): UcumCode | undefined {
  const key = text.trim().toLowerCase();
  if (key in UNIT_ALIASES) return UNIT_ALIASES[key];
  return (Object.keys(UNIT_LABELS) as UcumCode[]).find((u) => u === text.trim());
}

export const unitLabel = (unit: UcumCode): string => UNIT_LABELS[unit];
const storedUnit = (field: MeasuredField): UcumCode => MEASURED_FIELDS[field].units[0];

const fmt = (v: number) => String(Math.round(v * 1000) / 1000);

/**
 * A value that is plausible in another unit than its label says: kPa in a
 * mmHg column (PaO2 below 20, PaCO2 below 13), mmHg in a kPa column, a
 * fraction in a % column, g/L in a g/dL column. Reported per row; never
 * silently corrected.
 */
export function unitMismatch(
  field: MeasuredField,
  value: number,
  unit: UcumCode,
): RowReason | undefined {
  const label = MEASURED_FIELDS[field].label;
  const says = (other: string) => ({
    code: "unit" as const,
    field,
    message: `${label} column is labelled ${unitLabel(unit)} but ${fmt(value)} looks like ${other}; check the column's unit.`,
  });
  if ((field === "pao2" || field === "paco2") && (unit === "mm[Hg]" || unit === "kPa")) {
    const other = otherPressureUnit(field, value, unit === "kPa" ? "kPa" : "mmHg");
    if (other) return says(other);
  }
  if (
    (field === "sao2" || field === "spo2" || field === "fio2") &&
    unit === "%" &&
    value > 0 &&
    value <= 1
  ) {
    return says("a fraction (0–1)");
  }
  if ((field === "sao2" || field === "spo2" || field === "fio2") && unit === "1" && value > 1) {
    return says("a percentage");
  }
  if (field === "hemoglobin" && unit === "g/dL" && value > RANGES.hemoglobinGramsPerDecilitre.max) {
    return says("g/L");
  }
  return undefined;
}

/**
 * Converts an imported value to the unit Tidemark stores (mmHg, g/dL, mmol/L,
 * %, FiO2 as a fraction). Haemoglobin in mmol/L is per monomer, as laboratories
 * report it.
 */
export function convertToStored(
  field: MeasuredField,
  value: number,
  unit: UcumCode,
): { ok: true; value: number } | { ok: false; reason: RowReason } {
  const label = MEASURED_FIELDS[field].label;
  const allowed = MEASURED_FIELDS[field].units as readonly UcumCode[];
  if (!allowed.includes(unit)) {
    return {
      ok: false,
      reason: {
        code: "unit",
        field,
        message: `${label} in ${unitLabel(unit)} cannot be used; give it in ${allowed.map(unitLabel).join(" or ")}.`,
      },
    };
  }
  const target = storedUnit(field);
  if (unit === target) return { ok: true, value };
  // Unchecked conversions: the row schema then checks the stored value against the range table.
  const pressureFrom = PRESSURE_UNITS[unit];
  const pressureTo = PRESSURE_UNITS[target];
  if (pressureFrom && pressureTo) {
    return { ok: true, value: convertPressure(value, pressureFrom, pressureTo) };
  }
  const hemoglobinFrom = HEMOGLOBIN_UNITS[unit];
  const hemoglobinTo = HEMOGLOBIN_UNITS[target];
  if (field === "hemoglobin" && hemoglobinFrom && hemoglobinTo) {
    return { ok: true, value: convertHemoglobin(value, hemoglobinFrom, hemoglobinTo) };
  }
  const result = ucum.convertUnitTo(unit, value, target);
  if (result.status !== "succeeded" || result.toVal === null) {
    return {
      ok: false,
      reason: {
        code: "unit",
        field,
        message: `${label} ${fmt(value)} ${unitLabel(unit)} could not be converted to ${unitLabel(target)}.`,
      },
    };
  }
  return { ok: true, value: result.toVal };
}

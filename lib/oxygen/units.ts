import { checkRange, RANGES } from "./ranges";

export type PressureUnit = "mmHg" | "kPa";
export type HemoglobinUnit = "g/dL" | "g/L" | "mmol/L";

/** 1 kPa = 7.50062 mmHg (1 mmHg = 133.322387415 Pa by definition). */
export const MMHG_PER_KPA = 7.50062;

/**
 * Molar mass of the haemoglobin monomer (one haem, one globin chain), the
 * basis on which laboratories report Hb in mmol/L: 1 g/dL = 0.6206 mmol/L.
 */
export const HEMOGLOBIN_MONOMER_MOLAR_MASS = 16114.5;

const GRAMS_PER_LITRE_PER_GRAM_PER_DECILITRE = 10;
const MMOL_PER_LITRE_PER_GRAM_PER_DECILITRE =
  (GRAMS_PER_LITRE_PER_GRAM_PER_DECILITRE / HEMOGLOBIN_MONOMER_MOLAR_MASS) * 1000;

const pressureFactor: Record<PressureUnit, number> = { mmHg: 1, kPa: MMHG_PER_KPA };
const hemoglobinFactor: Record<HemoglobinUnit, number> = {
  "g/dL": 1,
  "g/L": GRAMS_PER_LITRE_PER_GRAM_PER_DECILITRE,
  "mmol/L": MMOL_PER_LITRE_PER_GRAM_PER_DECILITRE,
};

// Ranges are stated in the caller's unit so the message matches what was typed.
function checkInUnit(value: number, max: number, unit: string): void {
  checkRange("value", value, { min: 0, max, unit });
}

/** A pressure in `unit` converted to mmHg, the unit the engine computes in. */
export function toMmHg(value: number, unit: PressureUnit): number {
  checkInUnit(value, RANGES.pressureMmHg.max / pressureFactor[unit], unit);
  return value * pressureFactor[unit];
}

/** A pressure in mmHg converted to `unit`. */
export function fromMmHg(valueMmHg: number, unit: PressureUnit): number {
  checkRange("value", valueMmHg, RANGES.pressureMmHg);
  return valueMmHg / pressureFactor[unit];
}

/** A haemoglobin concentration in `unit` converted to g/dL. */
export function toGramsPerDecilitre(value: number, unit: HemoglobinUnit): number {
  checkInUnit(value, RANGES.hemoglobinGramsPerDecilitre.max * hemoglobinFactor[unit], unit);
  return value / hemoglobinFactor[unit];
}

/** A haemoglobin concentration in g/dL converted to `unit`. */
export function fromGramsPerDecilitre(
  valueGramsPerDecilitre: number,
  unit: HemoglobinUnit,
): number {
  checkRange("value", valueGramsPerDecilitre, RANGES.hemoglobinGramsPerDecilitre);
  return valueGramsPerDecilitre * hemoglobinFactor[unit];
}

/**
 * P/F ratio carries the unit of PaO2 (FiO2 is a fraction): "129 mmHg" or "17.2 kPa".
 * Not range-checked like a pressure, since ratios run above any PaO2.
 */
export function formatPfRatio(ratioMmHg: number, unit: PressureUnit): string {
  return unit === "kPa"
    ? `${(ratioMmHg / MMHG_PER_KPA).toFixed(1)} kPa`
    : `${Math.round(ratioMmHg)} mmHg`;
}

/**
 * A pressure stored in mmHg, formatted for display in `unit` with the unit
 * beside the value: whole mmHg, or kPa to one decimal unless told otherwise.
 */
export function formatPressure(
  valueMmHg: number,
  unit: PressureUnit,
  digits: number = unit === "kPa" ? 1 : 0,
): string {
  checkRange("digits", digits, { min: 0, max: 6, unit: "decimal places" });
  return `${fromMmHg(valueMmHg, unit).toFixed(Math.round(digits))} ${unit}`;
}

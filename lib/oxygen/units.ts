import { checkRange, type InputRange, RANGES } from "./ranges";

// The one edge where pressures and haemoglobin change units: the engine, the
// database and the API compute and store mmHg and g/dL; forms, imports and
// displays convert here, never with their own factor.

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

/**
 * A pressure converted between units without a range check: for values that
 * are not pressures in a physiological range (gradients can be negative,
 * ratios run above any PaO2, axis ends) and for imported values that the row
 * schema checks after conversion. Inputs to compute with go through toMmHg.
 */
export function convertPressure(value: number, from: PressureUnit, to: PressureUnit): number {
  return from === to ? value : (value * pressureFactor[from]) / pressureFactor[to];
}

/** A value in mmHg expressed in `unit` for display (no range check; see convertPressure). */
export function pressureIn(valueMmHg: number, unit: PressureUnit): number {
  return convertPressure(valueMmHg, "mmHg", unit);
}

/** Haemoglobin converted between units without a range check (imported values are checked after). */
export function convertHemoglobin(value: number, from: HemoglobinUnit, to: HemoglobinUnit): number {
  return from === to ? value : (value / hemoglobinFactor[from]) * hemoglobinFactor[to];
}

/**
 * Bounds rounded inward to `decimals`: every value the rounded range allows
 * lies inside the exact one, so a message never invites a value that is then
 * refused once converted back.
 */
export function roundInward(min: number, max: number, decimals: number): [number, number] {
  const scale = 10 ** decimals;
  return [Math.ceil(min * scale - 1e-9) / scale, Math.floor(max * scale + 1e-9) / scale];
}

/** A range in mmHg restated in `unit`, rounded inward (mmHg ranges come back as they are). */
export function restatePressureRange(
  rangeMmHg: InputRange,
  unit: PressureUnit,
  decimals = 2,
): InputRange {
  if (unit === "mmHg") return rangeMmHg;
  const [min, max] = roundInward(
    pressureIn(rangeMmHg.min, unit),
    pressureIn(rangeMmHg.max, unit),
    decimals,
  );
  return { min, max, unit };
}

/** A pressure in `unit` converted to mmHg, the unit the engine computes in. */
export function toMmHg(value: number, unit: PressureUnit): number {
  checkInUnit(value, pressureIn(RANGES.pressureMmHg.max, unit), unit);
  return convertPressure(value, unit, "mmHg");
}

/** A pressure in mmHg converted to `unit`. */
export function fromMmHg(valueMmHg: number, unit: PressureUnit): number {
  checkRange("value", valueMmHg, RANGES.pressureMmHg);
  return pressureIn(valueMmHg, unit);
}

/** A haemoglobin concentration in `unit` converted to g/dL. */
export function toGramsPerDecilitre(value: number, unit: HemoglobinUnit): number {
  checkInUnit(value, convertHemoglobin(RANGES.hemoglobinGramsPerDecilitre.max, "g/dL", unit), unit);
  return convertHemoglobin(value, unit, "g/dL");
}

/** A haemoglobin concentration in g/dL converted to `unit`. */
export function fromGramsPerDecilitre(
  valueGramsPerDecilitre: number,
  unit: HemoglobinUnit,
): number {
  checkRange("value", valueGramsPerDecilitre, RANGES.hemoglobinGramsPerDecilitre);
  return convertHemoglobin(valueGramsPerDecilitre, "g/dL", unit);
}

/**
 * P/F ratio carries the unit of PaO2 (FiO2 is a fraction): "129 mmHg" or "17.2 kPa".
 * Not range-checked like a pressure, since ratios run above any PaO2.
 */
export function formatPfRatio(ratioMmHg: number, unit: PressureUnit): string {
  return unit === "kPa"
    ? `${pressureIn(ratioMmHg, unit).toFixed(1)} kPa`
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

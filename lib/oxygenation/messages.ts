import {
  convertHemoglobin,
  type HemoglobinUnit,
  type OxygenInputError,
  pressureIn,
  type PressureUnit,
  roundInward,
} from "../oxygen";
import { FIELD_LABELS, rangeMessage } from "./schema";

/** The units a request was typed in, so a refusal can speak them back. */
export interface TypedUnits {
  pressureUnit: PressureUnit;
  hemoglobinUnit: HemoglobinUnit;
}

const DECIMALS: Record<string, number> = {
  mmHg: 0,
  kPa: 2,
  "g/dL": 1,
  "g/L": 0,
  "mmol/L": 2,
  fraction: 3,
};

/**
 * An engine refusal (OxygenInputError, always in mmHg, g/dL and fractions)
 * re-stated for the person who typed the request: the field's own label, the
 * range in the unit they typed, and the engine's reason when the range
 * depended on other inputs (e.g. the highest PaCO2 that leaves alveolar oxygen).
 */
export function describeInputError(
  error: OxygenInputError,
  units: TypedUnits,
): { field: string; message: string } {
  const label = FIELD_LABELS[error.field] ?? error.field;
  let { min, max, unit } = error;
  if (unit === "mmHg" && units.pressureUnit === "kPa") {
    [min, max, unit] = [pressureIn(min, "kPa"), pressureIn(max, "kPa"), "kPa"];
  } else if (unit === "g/dL" && units.hemoglobinUnit !== "g/dL") {
    const to = units.hemoglobinUnit;
    [min, max, unit] = [convertHemoglobin(min, "g/dL", to), convertHemoglobin(max, "g/dL", to), to];
  }
  // Rounded inward: every value inside the stated range is accepted.
  [min, max] = roundInward(min, max, DECIMALS[unit] ?? 2);
  const base = rangeMessage(label, min, max, unit);
  // The engine's message is "<field> must be between … (unit); got v — reason".
  const reason = error.message
    .split(" — ")[1]
    ?.replace(/\d+\.\d{3,}/g, (n) => Number(n).toFixed(1));
  return { field: error.field, message: reason ? `${base.slice(0, -1)}: ${reason}.` : base };
}

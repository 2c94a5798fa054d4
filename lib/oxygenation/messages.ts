import {
  fromGramsPerDecilitre,
  type HemoglobinUnit,
  MMHG_PER_KPA,
  type OxygenInputError,
  type PressureUnit,
} from "../oxygen";
import { FIELD_LABELS, rangeMessage } from "./schema";

/** The units a request was typed in, so a refusal can speak them back. */
export interface TypedUnits {
  pressureUnit: PressureUnit;
  hemoglobinUnit: HemoglobinUnit;
}

const DECIMALS: Record<string, number> = { mmHg: 0, kPa: 2, "g/dL": 1, "g/L": 0, "mmol/L": 2, fraction: 3 };

// Rounded inward: every value inside the stated range is accepted.
function inward(min: number, max: number, unit: string): [number, number] {
  const scale = 10 ** (DECIMALS[unit] ?? 2);
  return [Math.ceil(min * scale - 1e-9) / scale, Math.floor(max * scale + 1e-9) / scale];
}

/**
 * An engine refusal (OxygenInputError, always in mmHg, g/dL and fractions)
 * re-stated for the person who typed the request: the field's own label, the
 * range in the unit they typed, and the engine's reason when the range
 * depended on other inputs (e.g. the highest PaCO2 that leaves alveolar oxygen).
 */
export function describeInputError(error: OxygenInputError, units: TypedUnits): { field: string; message: string } {
  const label = FIELD_LABELS[error.field] ?? error.field;
  let { min, max, unit } = error;
  if (unit === "mmHg" && units.pressureUnit === "kPa") {
    [min, max, unit] = [min / MMHG_PER_KPA, max / MMHG_PER_KPA, "kPa"];
  } else if (unit === "g/dL" && units.hemoglobinUnit !== "g/dL") {
    const factor = fromGramsPerDecilitre(1, units.hemoglobinUnit);
    [min, max, unit] = [min * factor, max * factor, units.hemoglobinUnit];
  }
  [min, max] = inward(min, max, unit);
  const base = rangeMessage(label, min, max, unit);
  // The engine's message is "<field> must be between … (unit); got v — reason".
  const reason = error.message.split(" — ")[1]?.replace(/\d+\.\d{3,}/g, (n) => Number(n).toFixed(1));
  return { field: error.field, message: reason ? `${base.slice(0, -1)}: ${reason}.` : base };
}

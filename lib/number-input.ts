import { z } from "zod";
import { betweenWords, rangeRefusal, type InputRange } from "./oxygen/ranges";

// How an empty number field is read, in one place for the forms and the
// shared schemas: "", whitespace, null, undefined and NaN (what an emptied
// input can hand over) mean "not given"; anything else is left for the schema
// to accept or to refuse by name.

/** True for a number field left empty. */
export function isEmptyInput(value: unknown): boolean {
  return (
    value === undefined ||
    value === null ||
    (typeof value === "string" && value.trim() === "") ||
    (typeof value === "number" && Number.isNaN(value))
  );
}

/** An empty field as undefined (zod's "optional"); any other value unchanged. */
export function emptyToUndefined(value: unknown): unknown {
  return isEmptyInput(value) ? undefined : value;
}

/**
 * What a text input holds as a number: empty is undefined, a decimal comma is
 * accepted, and text that is not a number stays NaN for the schema to name.
 */
export function toNumber(value: unknown): number | undefined {
  if (isEmptyInput(value)) return undefined;
  if (typeof value === "number") return value;
  return Number(String(value).trim().replace(",", "."));
}

/** A schema's optional number: an empty field is "not given", not a refusal. */
export function optionalNumber<S extends z.ZodType>(schema: S) {
  return z.preprocess(emptyToUndefined, schema.optional());
}

/**
 * A number inside a range of the range table, refused in the schemas' words:
 * "PEEP minimum must be between 0 and 30 cmH2O." (and "… must be a number
 * between …" when it is not a number at all).
 */
export function rangedNumber(label: string, range: InputRange) {
  const refusal = rangeRefusal(label, range);
  return z
    .number({ error: `${label} must be a number ${betweenWords(range)}.` })
    .min(range.min, refusal)
    .max(range.max, refusal);
}

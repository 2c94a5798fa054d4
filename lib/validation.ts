import { z } from "zod";
import { ValidationError, type FieldErrors } from "./errors";

/** Flattens zod issues into `{ "path.to.field": [messages] }`. */
export function toFieldErrors(error: z.ZodError): FieldErrors {
  const out: FieldErrors = {};
  for (const issue of error.issues) {
    const key = issue.path.length ? issue.path.join(".") : "_form";
    (out[key] ??= []).push(issue.message);
  }
  return out;
}

/** Parses with the shared schema or throws a ValidationError naming each field. */
export function parseInput<S extends z.ZodType>(schema: S, input: unknown): z.output<S> {
  const parsed = schema.safeParse(input);
  if (!parsed.success) {
    throw new ValidationError("Some fields need attention.", toFieldErrors(parsed.error));
  }
  return parsed.data;
}

/** The range a DATETIME column holds; a time outside it cannot be compared in SQL (400, not 500). */
export const DATETIME_RANGE = {
  min: Date.UTC(1000, 0, 1),
  max: Date.UTC(9999, 11, 31, 23, 59, 59),
};
/** The range of system-versioned history (TIMESTAMP): 1970 to 19 January 2038. */
export const HISTORY_RANGE = {
  min: Date.UTC(1970, 0, 1, 0, 0, 1),
  max: Date.UTC(2038, 0, 19, 3, 14, 7),
};

/** A date and time in a query string, inside the range the database can use. */
export function queryTime(label: string, range: { min: number; max: number } = DATETIME_RANGE) {
  const words = `${label} must be a date and time between ${new Date(range.min).toISOString().slice(0, 10)} and ${new Date(range.max).toISOString().slice(0, 10)}.`;
  return z.coerce
    .date({ error: words })
    .refine((d) => d.getTime() >= range.min && d.getTime() <= range.max, words);
}

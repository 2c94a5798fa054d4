import type { z } from "zod";
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

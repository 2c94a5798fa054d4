/** What an out-of-range input carries, so the boundary can map it to a field error. */
export interface OxygenInputErrorDetails {
  /** The argument's name or path, e.g. "fio2" or "order.limits.fio2Max". */
  field: string;
  value: number;
  min: number;
  max: number;
  unit: string;
  /** Why the range is what it is, when it depends on other inputs. */
  reason?: string;
}

function formatBound(bound: number): string {
  // Dynamic bounds (e.g. the highest PaCO2 that keeps PAO2 positive) are
  // irrational; six significant digits are enough to act on.
  return String(Number(bound.toPrecision(6)));
}

/**
 * Thrown by every engine function for a non-finite or out-of-range input.
 * The engine never answers NaN or Infinity; it refuses instead.
 */
export class OxygenInputError extends Error {
  override readonly name = "OxygenInputError";
  readonly field: string;
  readonly value: number;
  readonly min: number;
  readonly max: number;
  readonly unit: string;

  constructor({ field, value, min, max, unit, reason }: OxygenInputErrorDetails) {
    super(
      `${field} must be between ${formatBound(min)} and ${formatBound(max)} (${unit}); got ${value}` +
        (reason ? ` — ${reason}` : ""),
    );
    this.field = field;
    this.value = value;
    this.min = min;
    this.max = max;
    this.unit = unit;
  }
}

/** What a refused choice carries: the argument, what was given, and what is accepted. */
export interface OxygenChoiceErrorDetails {
  field: string;
  value: unknown;
  allowed: readonly string[];
  reason?: string;
}

/**
 * Thrown for an argument that must be one of a fixed set of words (a sex, a
 * unit, a cylinder size, an imputation method), or for a pair of arguments of
 * which exactly one must be given. The typed check of a caller cannot reach
 * values read from a form or a file; this refusal can.
 */
export class OxygenChoiceError extends Error {
  override readonly name = "OxygenChoiceError";
  readonly field: string;
  readonly value: unknown;
  readonly allowed: readonly string[];

  constructor({ field, value, allowed, reason }: OxygenChoiceErrorDetails) {
    super(
      `${field} must be one of ${allowed.join(", ")}; got ${JSON.stringify(value) ?? String(value)}` +
        (reason ? ` — ${reason}` : ""),
    );
    this.field = field;
    this.value = value;
    this.allowed = allowed;
  }
}

/** Returns `value` if it is one of `allowed`, else throws an OxygenChoiceError. */
export function checkChoice<const Choice extends string>(
  field: string,
  value: unknown,
  allowed: readonly Choice[],
): Choice {
  if (typeof value !== "string" || !(allowed as readonly string[]).includes(value)) {
    throw new OxygenChoiceError({ field, value, allowed });
  }
  return value as Choice;
}

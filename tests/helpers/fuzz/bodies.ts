import fc from "fast-check";
import type { z } from "zod";
import { oddNumber, oddString, oddValue, Raw, toJson, wrongType } from "./values";

/**
 * Request bodies built from a route's zod schema: each field of the schema is
 * described once here (its JSON type and bounds, and values it accepts), and a
 * body is either a valid-looking one with at least one field broken so the
 * schema must refuse it, or random JSON, or not JSON at all.
 */

/**
 * `required: "typed"`: optional, but a value of the wrong type or length is still refused.
 * `pin` (the sampled phase): "fixed" is never perturbed (passwords, versions read at send
 * time); "invalid" is perturbed only to values its schema refuses, so an id never names
 * another patient's or account's row.
 */
type Common = {
  valid: fc.Arbitrary<unknown>;
  required?: boolean | "typed";
  pin?: "fixed" | "invalid";
};
export type Field =
  | (Common & { kind: "number"; min?: number; max?: number; int?: boolean; nullable?: boolean })
  | (Common & { kind: "string"; min?: number; max?: number; trim?: boolean })
  | (Common & { kind: "enum"; values: readonly string[] })
  | (Common & { kind: "boolean" })
  /** `max`: the most items the schema takes (50 unless told); one more is refused. */
  | (Common & { kind: "array"; max?: number })
  /** Coerced by the schema (z.coerce.date): perturbed, never the field that is broken on purpose. */
  | (Common & { kind: "coerced" });

export type BodySpec = {
  fields: Record<string, Field>;
  /** A strictObject: an unknown key alone is a refusal. */
  strict?: boolean;
};

/** Keys of an object schema, through a refinement or transform (a ZodPipe's input). */
export function schemaKeys(schema: z.ZodType): string[] {
  const s = schema as unknown as { shape?: Record<string, unknown>; in?: z.ZodType };
  if (s.shape) return Object.keys(s.shape).sort();
  if (s.in) return schemaKeys(s.in);
  throw new Error("not an object schema");
}

type Broken = { omit: true } | { value: unknown };
const omitted = fc.constant<Broken>({ omit: true });
const as = (a: fc.Arbitrary<unknown>) => a.map((value): Broken => ({ value }));

/** Values outside [min, max], and non-integers for an integer field. */
function outOfRange(f: { min?: number; max?: number; int?: boolean }): fc.Arbitrary<unknown>[] {
  const out: fc.Arbitrary<unknown>[] = [fc.constantFrom(new Raw("1e999"), new Raw("-1e999"))];
  if (f.min !== undefined) {
    out.push(fc.double({ max: f.min, maxExcluded: true, noNaN: true, noDefaultInfinity: true }));
    out.push(fc.constant(f.min === 0 ? -Number.MIN_VALUE : -1e308));
  }
  if (f.max !== undefined)
    out.push(fc.double({ min: f.max, minExcluded: true, noNaN: true, noDefaultInfinity: true }));
  if (f.int) {
    const lo = f.min ?? -1e6;
    const hi = f.max ?? 1e6;
    out.push(fc.double({ min: lo, max: hi, noNaN: true }).filter((v) => !Number.isInteger(v)));
    out.push(fc.constantFrom(Number.MAX_SAFE_INTEGER + 2, 1e21, 2 ** 64));
  }
  return out;
}

/** A replacement (or removal) for a required field that its schema must refuse. */
export function breakField(f: Field): fc.Arbitrary<Broken> {
  const omit = f.required === true ? omitted : fc.constant<Broken>({ value: null });
  switch (f.kind) {
    case "number":
      return fc.oneof(omit, as(wrongType("number", !f.nullable)), ...outOfRange(f).map(as));
    case "string": {
      const options = [omit, as(wrongType("string"))];
      if (f.max !== undefined) {
        const n = f.max;
        options.push(as(fc.integer({ min: n + 1, max: n + 80 }).map((len) => "é".repeat(len))));
      }
      if (f.min && f.trim) options.push(as(fc.constantFrom(" ", "\t\n ", " ".repeat(300))));
      else if (f.min) options.push(as(fc.constant("")));
      return fc.oneof(...options);
    }
    case "enum":
      return fc.oneof(
        omit,
        as(wrongType("string")),
        as(oddString.filter((s) => !f.values.includes(s))),
        as(fc.constantFrom(...f.values).map((v) => ` ${v.toUpperCase()}`)),
      );
    case "boolean":
      return fc.oneof(omit, as(wrongType("boolean")));
    case "array":
      return fc.oneof(
        omit,
        as(wrongType("array")),
        as(fc.constant([])),
        as(
          fc.array(fc.oneof(wrongType("number"), fc.constantFrom(0, -1, 1.5)), {
            minLength: 1,
            maxLength: 4,
          }),
        ),
        as(
          fc.array(fc.integer({ min: 1, max: 9 }), {
            minLength: (f.max ?? 50) + 1,
            maxLength: (f.max ?? 50) + 10,
          }),
        ),
      );
    case "coerced":
      throw new Error("a coerced field is never the broken one");
  }
}

/** A field's value in a valid-looking body: mostly a valid one, sometimes odd, sometimes left out. */
function perturbed(f: Field): fc.Arbitrary<unknown> {
  return fc.oneof(
    { weight: 6, arbitrary: f.valid },
    { weight: 2, arbitrary: oddValue },
    { weight: 1, arbitrary: fc.constant(undefined) },
  );
}

const extraKey = fc.oneof(
  fc.constantFrom(
    "__proto__",
    "constructor",
    "id",
    "role",
    "createdBy",
    "status",
    "version",
    "unitId",
  ),
  fc.string({ minLength: 1, maxLength: 12 }),
);

function extras(spec: BodySpec, minKeys: number): fc.Arbitrary<Record<string, unknown>> {
  return fc.dictionary(
    extraKey.filter((k) => !Object.hasOwn(spec.fields, k)),
    oddValue,
    { minKeys, maxKeys: minKeys + 3 },
  );
}

/** Fields that can be broken on purpose; `strictly`: only those whose absence alone is refused. */
function breakable(spec: BodySpec, strictly = false): string[] {
  return Object.entries(spec.fields)
    .filter(([, f]) => (strictly ? f.required === true : f.required) && f.kind !== "coerced")
    .map(([k]) => k);
}

/**
 * A body shaped like the schema with every field present or perturbed and one
 * required field broken (or, for a strict schema, an unknown key added): the
 * schema must refuse it, whatever the other fields hold.
 */
export function brokenObject(spec: BodySpec): fc.Arbitrary<Record<string, unknown>> {
  const keys = breakable(spec);
  const values = fc.record(
    Object.fromEntries(Object.entries(spec.fields).map(([k, f]) => [k, perturbed(f)])),
  );
  const broken = spec.strict
    ? fc.oneof(
        fc.constant(null),
        fc
          .constantFrom(...keys)
          .chain((k) => breakField(spec.fields[k]!).map((b) => [k, b] as const)),
      )
    : fc
        .constantFrom(...keys)
        .chain((k) => breakField(spec.fields[k]!).map((b) => [k, b] as const));
  return fc.tuple(values, broken, fc.boolean()).chain(([vals, brk, withExtra]) =>
    // A strict schema with nothing broken gets at least one unknown key: that alone is refused.
    extras(spec, brk === null ? 1 : withExtra ? 1 : 0).map((extra) => {
      const body: Record<string, unknown> = { ...extra, ...vals };
      if (brk !== null) {
        const [k, b] = brk;
        if ("omit" in b) delete body[k];
        else body[k] = b.value;
      }
      return body;
    }),
  );
}

/** A random JSON object missing at least one required field (so it is refused). */
export function randomObject(spec: BodySpec): fc.Arbitrary<Record<string, unknown>> {
  const names = Object.keys(spec.fields);
  const key = fc.oneof(fc.constantFrom(...names), fc.string({ maxLength: 10 }));
  return fc
    .tuple(fc.dictionary(key, oddValue, { maxKeys: 8 }), fc.constantFrom(...breakable(spec, true)))
    .map(([obj, missing]) => {
      const out = { ...obj };
      delete out[missing];
      return out;
    });
}

/** JSON that is not an object, or text that is not JSON at all. */
export const notAnObject: fc.Arbitrary<string> = fc.oneof(
  fc
    .oneof(
      fc.array(oddValue, { maxLength: 4 }),
      oddNumber,
      oddString,
      fc.boolean(),
      fc.constant(null),
    )
    .map(toJson),
  fc.constantFrom(
    "",
    "{",
    "}",
    "{'a':1}",
    '{"a":1,}',
    "[1,]",
    "NaN",
    "undefined",
    "\ufeff{}",
    "{}garbage",
    '{"a":"\u0000"',
    "\u0000",
    "nul",
    '{"a":1}{"b":2}',
    '{"__proto__":{"polluted":1}}x',
  ),
  fc.string({ unit: "binary", maxLength: 60 }).filter((s) => {
    try {
      JSON.parse(s);
      return false;
    } catch {
      return true;
    }
  }),
);

/** Any body a route must refuse by construction: mostly schema-shaped with a broken field. */
export function refusedBody(spec: BodySpec): fc.Arbitrary<string> {
  return fc.oneof(
    { weight: 7, arbitrary: brokenObject(spec).map(toJson) },
    { weight: 2, arbitrary: randomObject(spec).map(toJson) },
    { weight: 2, arbitrary: notAnObject },
  );
}

/**
 * A valid-looking body for the sampled per-request phase: every field valid,
 * then none, one or two of them perturbed (odd, or a value the schema refuses).
 */
export function nearValidObject(spec: BodySpec): fc.Arbitrary<Record<string, unknown>> {
  const valid = fc.record(
    Object.fromEntries(Object.entries(spec.fields).map(([k, f]) => [k, f.valid])),
  );
  const open = Object.entries(spec.fields).filter(([, f]) => f.pin !== "fixed");
  const odd = (f: Field) => {
    const refused =
      f.kind === "coerced"
        ? oddValue
        : breakField(f).map((b) => ("omit" in b ? undefined : b.value));
    return f.pin === "invalid" ? refused : fc.oneof(oddValue, refused);
  };
  const howMany = fc.oneof(
    { weight: 2, arbitrary: fc.constant(0) },
    { weight: 2, arbitrary: fc.constant(1) },
    { weight: 1, arbitrary: fc.constant(2) },
  );
  const changes = howMany
    .map((n) => Math.min(n, open.length))
    .chain((n) =>
      n === 0
        ? fc.constant([] as [string, unknown][])
        : fc
            .uniqueArray(fc.constantFrom(...open), {
              minLength: n,
              maxLength: n,
              selector: ([k]) => k,
            })
            .chain((picked) =>
              fc.tuple(...picked.map(([k, f]) => odd(f).map((v): [string, unknown] => [k, v]))),
            ),
    );
  return fc.tuple(valid, changes).map(([body, swaps]) => {
    const out: Record<string, unknown> = { ...body };
    for (const [k, v] of swaps) out[k] = v;
    return out;
  });
}

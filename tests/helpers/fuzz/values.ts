import fc from "fast-check";

/**
 * Value generators for the API fuzz (tests/e2e/api-fuzz.test.ts): the odd
 * inputs a client can put in JSON, a query string or a path segment.
 */

/** A JSON token written as-is: what JSON.stringify cannot produce (1e999, -0, 20-digit integers). */
export class Raw {
  constructor(readonly text: string) {}
}

/** JSON text of a value that may hold Raw tokens; undefined members are left out, as JSON.stringify does. */
export function toJson(value: unknown): string {
  if (value instanceof Raw) return value.text;
  if (Array.isArray(value))
    return `[${value.map((v) => (v === undefined ? "null" : toJson(v))).join(",")}]`;
  if (value !== null && typeof value === "object") {
    const members = Object.entries(value as Record<string, unknown>)
      .filter(([, v]) => v !== undefined)
      .map(([k, v]) => `${JSON.stringify(k)}:${toJson(v)}`);
    return `{${members.join(",")}}`;
  }
  return JSON.stringify(value) ?? "null";
}

const rawNumber = fc
  .constantFrom(
    "1e999",
    "-1e999",
    "-0",
    "1e-400",
    "18446744073709551616",
    "-9223372036854775809",
    "123456789012345678901234567890",
    "0.30000000000000004",
    "1E+2",
  )
  .map((t) => new Raw(t));

export const hugeNumber = fc.constantFrom(
  1e308,
  -1e308,
  Number.MAX_VALUE,
  Number.MIN_VALUE,
  Number.MAX_SAFE_INTEGER,
  Number.MAX_SAFE_INTEGER + 2,
  2 ** 31,
  2 ** 32,
  2 ** 63,
  -(2 ** 31) - 1,
  -1,
  0,
  0.5,
);

export const oddNumber: fc.Arbitrary<unknown> = fc.oneof(
  hugeNumber,
  rawNumber,
  fc.integer(),
  fc.double({ noNaN: true, noDefaultInfinity: true }),
  fc.bigInt({ min: -(2n ** 80n), max: 2n ** 80n }).map((n) => new Raw(n.toString())),
);

/** Strings that tend to break things: control and direction characters, lone surrogates, SQL and markup. */
export const SPECIAL_STRINGS = [
  "",
  " ",
  "   \t\n",
  "\u0000",
  "a\u0000b",
  "\u202eevil\u202c",
  "مرحبا بالعالم",
  "שלום עולם",
  "💨🫁🩺",
  "👩🏽‍⚕️",
  "\ud800",
  "x\udfffy",
  "\ufeff",
  "\u200b\u200d",
  "Robert'); DROP TABLE readings;--",
  "' OR '1'='1",
  "<script>alert(1)</script>",
  "${7*7}{{7*7}}",
  "%00%ff",
  "\r\n\r\n",
  "NaN",
  "Infinity",
  "-Infinity",
  "null",
  "undefined",
  "true",
  "1e308",
  "-0",
  "0x10",
  " 42 ",
  "١٢٣",
  "９９",
  "__proto__",
  "constructor",
] as const;

/** Dates and times, many outside what MariaDB's DATETIME (1000–9999) or TIMESTAMP (1970–2038) hold. */
export const ODD_TIMES = [
  "99999-01-01",
  "+275760-09-13T00:00:00.000Z",
  "-271821-04-20T00:00:00.000Z",
  "+010000-01-01T00:00:00Z",
  "9999-12-31T23:59:59.999Z",
  "1000-01-01T00:00:00Z",
  "0999-12-31T23:59:59Z",
  "0000-00-00 00:00:00",
  "1969-12-31T23:59:59Z",
  "1970-01-01T00:00:00Z",
  "2038-01-19T03:14:08Z",
  "2026-02-30T12:00:00Z",
  "2026-13-45T99:99:99Z",
  "2026-06-01T12:00:00+14:00",
  "2026-06-01T12:00:00-23:59",
  "2026-06-01",
  "yesterday",
  "0",
  "-1",
  "8640000000000001",
] as const;

const longString = fc
  .tuple(
    fc.constantFrom("x", "💨", "\u202e", " ", "\u0000", "é"),
    fc.constantFrom(257, 501, 2_001, 5_000),
  )
  .map(([unit, n]) => unit.repeat(n));

/** 70k and 100k characters: more than a JSON body may carry (64 KB), so rare. */
export const hugeString = fc
  .tuple(fc.constantFrom("x", "💨", "\u202e", "ש"), fc.constantFrom(70_000, 100_000))
  .map(([unit, n]) => unit.repeat(n));

export const oddString: fc.Arbitrary<string> = fc.oneof(
  { weight: 25, arbitrary: fc.constantFrom(...SPECIAL_STRINGS) },
  { weight: 12, arbitrary: fc.constantFrom(...ODD_TIMES) },
  { weight: 20, arbitrary: fc.string({ maxLength: 40 }) },
  { weight: 20, arbitrary: fc.string({ unit: "binary", maxLength: 40 }) },
  { weight: 12, arbitrary: fc.string({ unit: "grapheme", maxLength: 20 }) },
  { weight: 10, arbitrary: longString },
  { weight: 1, arbitrary: hugeString },
);

/** Arrays nested thousands deep, as raw JSON (an object would be refused as too large first). */
const deepNest = fc
  .tuple(fc.constantFrom("[", '{"a":'), fc.integer({ min: 100, max: 5_000 }))
  .map(
    ([open, depth]) => new Raw(`${open.repeat(depth)}1${(open === "[" ? "]" : "}").repeat(depth)}`),
  );

export const scalar: fc.Arbitrary<unknown> = fc.oneof(
  oddNumber,
  oddString,
  fc.boolean(),
  fc.constant(null),
);

/** Anything a JSON body can hold, nested a little, with the odd values above as leaves. */
export const oddValue: fc.Arbitrary<unknown> = fc.oneof(
  { weight: 6, arbitrary: scalar },
  { weight: 2, arbitrary: fc.array(scalar, { maxLength: 5 }) },
  { weight: 2, arbitrary: fc.dictionary(fc.string({ maxLength: 8 }), scalar, { maxKeys: 4 }) },
  { weight: 1, arbitrary: fc.jsonValue({ maxDepth: 3 }) },
  { weight: 1, arbitrary: deepNest },
);

/**
 * Percent-encodes for a URL; a lone surrogate (which encodeURIComponent refuses)
 * goes out as the bytes of one, ED A0 80: not UTF-8, as a client could send.
 */
export function enc(s: string): string {
  const wellFormed = s.replace(
    /[\ud800-\udbff](?![\udc00-\udfff])|(?<![\ud800-\udbff])[\udc00-\udfff]/g,
    "\ufffd",
  );
  return encodeURIComponent(wellFormed).replaceAll("%EF%BF%BD", "%ED%A0%80");
}

/** A value of another JSON type than `kind`, so a schema of that type must refuse it. */
export function wrongType(
  kind: "number" | "string" | "boolean" | "array",
  allowNull = true,
): fc.Arbitrary<unknown> {
  const options: fc.Arbitrary<unknown>[] = [
    fc.dictionary(fc.string({ maxLength: 6 }), scalar, { maxKeys: 3 }),
  ];
  if (kind !== "array") options.push(fc.array(scalar, { maxLength: 3 }));
  if (allowNull) options.push(fc.constant(null));
  if (kind !== "number") options.push(oddNumber);
  if (kind !== "string") options.push(oddString);
  if (kind !== "boolean") options.push(fc.boolean());
  return fc.oneof(...options);
}

/**
 * Path segments an id route must refuse or not find (never a 500). "." and ".."
 * (also as %2e) are left out: the client resolves them away, so they never reach the route.
 */
export const oddPathSegment: fc.Arbitrary<string> = fc
  .oneof(
    fc.constantFrom(
      "0",
      "-1",
      "-0",
      "abc",
      "1.5",
      "1e400",
      "NaN",
      "Infinity",
      "99999999999999999999",
      "9007199254740993",
      "2147483648",
      "18446744073709551616",
      "%20",
      "%00",
      "%F0%9F%92%A8",
      "%E2%80%AE1",
      "1%2F2",
      "%D9%A3",
      "null",
      "%5B%5D",
      "1;DROP",
      "%25",
    ),
    fc.integer({ min: -(2 ** 31), max: 0 }).map(String),
    fc.bigInt({ min: 2n ** 53n, max: 2n ** 80n }).map(String),
    fc.string({ unit: "binary", minLength: 1, maxLength: 12 }).map(enc),
  )
  .filter((seg) => !/^(\.|%2e){1,2}$/i.test(seg));

/** An id that parses but names no row: far above anything the tests create. */
export const absentId = fc.integer({ min: 1_000_000_000, max: 2_147_483_647 }).map(String);

/** A query-string value: plain, odd, or percent-encoded bytes that are not UTF-8. */
export const oddQueryValue: fc.Arbitrary<string> = fc.oneof(
  { weight: 5, arbitrary: oddString.filter((s) => s.length < 5_000).map(enc) },
  { weight: 2, arbitrary: oddNumber.map((v) => enc(v instanceof Raw ? v.text : String(v))) },
  { weight: 1, arbitrary: fc.constantFrom("%", "%zz", "%C0%AF", "%FF%FE", "a=b=c", "", "%2526") },
);

import fc from "fast-check";
import { IMPORT_KINDS } from "@/lib/imports/kinds";
import { BASE_URL } from "../browser";
import { brokenObject, notAnObject, refusedBody, randomObject } from "./bodies";
import type { BodySpecs, Ids } from "./specs";
import { absentId, enc, oddPathSegment, oddString, oddValue, toJson } from "./values";
import { describeCase, type Access, type FuzzCase, type Part, type Who } from "./case";
import type { ReadIds } from "./reads";

/**
 * Every write route of /api/v1 as a generator of requests that must be refused:
 * the body is broken by construction (bodies.ts), or the target cannot exist,
 * or the caller may not write (no session, another origin, not JSON).
 */

const ORIGIN = new URL(BASE_URL).origin;
const JSON_TYPES = ["application/json", "application/json; charset=utf-8", "APPLICATION/JSON"];

/** Who sends a cookie-session write and with which headers; most as the allowed role from our origin. */
function sessionAccess(role: Who, json = true): fc.Arbitrary<Access> {
  const type = json ? fc.constantFrom(...JSON_TYPES) : fc.constant("multipart");
  const withType = (headers: Record<string, string>) =>
    type.map((ct): Access => ({
      who: role,
      headers: ct === "multipart" ? headers : { ...headers, "content-type": ct },
    }));
  return fc.oneof(
    { weight: 80, arbitrary: withType({ origin: ORIGIN }) },
    {
      weight: 6,
      arbitrary: withType({ origin: ORIGIN }).map((a) => ({ ...a, who: "anonymous" as const })),
    },
    {
      weight: 5,
      arbitrary: fc
        .constantFrom(
          "https://evil.example",
          "null",
          `${ORIGIN}/`,
          ORIGIN.replace("localhost", "127.0.0.1"),
          ORIGIN.toUpperCase(),
          `${ORIGIN}.evil.example`,
          "http://localhost",
        )
        .chain((origin) => withType({ origin })),
    },
    {
      weight: 3,
      arbitrary: fc
        .constantFrom("cross-site", "same-site")
        .chain((site) => withType({ "sec-fetch-site": site })),
    },
    {
      weight: 6,
      arbitrary: fc
        .constantFrom(
          "text/plain",
          "text/plain;charset=UTF-8",
          "application/x-www-form-urlencoded",
          "multipart/form-data; boundary=fuzz",
          "application/xml",
          "text/json",
          "application/json-patch+json",
          "",
          "none",
        )
        .map((ct): Access =>
          ct === "none"
            ? { who: role, headers: { origin: ORIGIN }, noType: true }
            : { who: role, headers: { origin: ORIGIN, "content-type": ct } },
        ),
    },
  );
}

const idempotencyHeader = fc.option(
  fc.oneof(
    fc.stringMatching(/^[A-Za-z0-9-]{8,64}$/),
    fc.string({ unit: "grapheme-ascii", maxLength: 80 }).filter((s) => /^[\x20-\x7e]*$/.test(s)),
  ),
  { nil: undefined, freq: 3 },
);

/** A path segment for an id: a row that exists, one that cannot, or something that is no id. */
const idSegment = (existing: number[]) =>
  fc.oneof(
    { weight: 5, arbitrary: fc.constantFrom(...(existing.length ? existing : [1])).map(String) },
    { weight: 2, arbitrary: absentId },
    { weight: 3, arbitrary: oddPathSegment },
  );

/** A segment that names no row by construction: refused as malformed, or not found. */
export const refusedSegment = fc.oneof(absentId, oddPathSegment).filter((seg) => {
  let decoded: string;
  try {
    decoded = decodeURIComponent(seg);
  } catch {
    return true;
  }
  const n = Number(decoded);
  return !(Number.isSafeInteger(n) && n > 0 && n < 1e9);
});

function make(route: string, c: Omit<FuzzCase, "route">): FuzzCase {
  return Object.assign(
    { route, ...c },
    { [fc.toStringMethod]: () => describeCase({ route, ...c }) },
  );
}

/** A cookie-session JSON write. */
function jsonWrite(
  route: string,
  role: Who,
  path: fc.Arbitrary<string>,
  body: fc.Arbitrary<string>,
  idempotency = false,
): fc.Arbitrary<FuzzCase> {
  const method = route.split(" ")[0]!;
  return fc
    .tuple(
      sessionAccess(role),
      path,
      body,
      idempotency ? idempotencyHeader : fc.constant(undefined),
    )
    .map(([access, p, b, key]) =>
      make(route, {
        method,
        path: p,
        who: access.who,
        headers: key === undefined ? access.headers : { ...access.headers, "idempotency-key": key },
        body: access.noType ? { bytes: b } : b,
        write: true,
      }),
    );
}

/** The upload (multipart): kind or unit broken, or no file, or an empty one; or not multipart at all. */
function uploadCase(units: number[]): fc.Arbitrary<FuzzCase> {
  const badUnit = fc.constantFrom(
    "abc",
    "",
    "0",
    "-1",
    "1.5",
    "NaN",
    "Infinity",
    "1e400",
    "99999999999999999999",
    " ",
    "-0",
  );
  const goodKind = fc.constantFrom(...IMPORT_KINDS);
  const badKind = oddString.filter((s) => !(IMPORT_KINDS as readonly string[]).includes(s));
  const text = fc.oneof(
    oddString,
    fc.constantFrom("time,spo2\n2026-11-20T08:00:00Z,95\n", "MRN,Sampled at\n"),
  );
  const file = (content: fc.Arbitrary<string>) =>
    fc
      .tuple(
        oddString.filter((s) => s.length < 300),
        content,
      )
      .map(([name, c]): Part => ({ name: "file", fileName: name || "f.csv", content: c }));
  const fields = (
    kind: fc.Arbitrary<string | null>,
    unit: fc.Arbitrary<string>,
    f: fc.Arbitrary<Part | null>,
  ) =>
    fc
      .tuple(kind, unit, f, fc.option(oddString), fc.option(oddString), fc.option(oddString))
      .map(([k, u, fl, d, m, b]) => {
        const parts: Part[] = [];
        if (k !== null) parts.push({ name: "kind", value: k });
        parts.push({ name: "unitId", value: u });
        if (d !== null) parts.push({ name: "delimiter", value: d });
        if (m !== null) parts.push({ name: "mrn", value: m });
        if (b !== null) parts.push({ name: "bed", value: b });
        if (fl) parts.push(fl);
        return { parts };
      });
  const goodUnit = fc.constantFrom(...units.map(String));
  const anyFile = fc.option(file(text), { nil: null });
  const parts = fc.oneof(
    fields(fc.option(badKind, { nil: null }), fc.oneof(goodUnit, badUnit), anyFile),
    fields(goodKind, badUnit, anyFile),
    fields(goodKind, goodUnit, fc.oneof(fc.constant(null), file(fc.constant("")))),
    fields(
      goodKind,
      goodUnit,
      text.map((t): Part => ({ name: "file", value: t })),
    ),
  );
  const raw = fc.oneof(notAnObject, oddString).map((s) => ({ bytes: s }));
  return fc
    .tuple(
      sessionAccess("therapist", false),
      fc.oneof({ weight: 4, arbitrary: parts }, { weight: 1, arbitrary: raw }),
    )
    .map(([access, body]) => {
      // Raw bytes go out as "multipart" with a boundary that is not in them: the form cannot be read.
      const headers =
        "bytes" in body && !access.headers["content-type"]
          ? { ...access.headers, "content-type": "multipart/form-data; boundary=fuzz-not-there" }
          : access.headers;
      return make("POST /api/v1/imports", {
        method: "POST",
        path: "/api/v1/imports",
        who: access.who,
        headers,
        body,
        write: true,
      });
    });
}

/** Authorization headers that are not the valid token (or carry it malformed). */
function badAuthorization(token: string): fc.Arbitrary<string | undefined> {
  return fc.oneof(
    fc.constant(undefined),
    fc.constantFrom(
      "Bearer",
      "Bearer ",
      "Basic dXNlcjpwYXNz",
      `Bearer ${token}x`,
      `Bearer ${token} ${token}`,
      `Token ${token}`,
    ),
    fc.stringMatching(/^[A-Za-z0-9_-]{43}$/).map((s) => `Bearer tdm_${s}`),
    fc
      .string({ unit: "grapheme-ascii", maxLength: 60 })
      .filter((s) => /^[\x20-\x7e]*$/.test(s))
      .map((s) => `Bearer ${s}`),
    fc.constant(`Bearer ${"A".repeat(6000)}`),
  );
}

/** The interface-engine routes: a valid token with a body or query refused by construction, or no valid token. */
function tokenRoute(route: "hl7" | "monitor", token: string): fc.Arbitrary<FuzzCase> {
  const path = `/api/v1/imports/${route}`;
  const body = fc.oneof(oddString, notAnObject, fc.constant(""));
  const partial = fc.option(fc.oneof(fc.constant("accept"), oddString.map(enc)), {
    nil: undefined,
  });
  const mrnOk = fc.stringMatching(/^[A-Z0-9]{3,12}$/);
  const badField = (max: number) =>
    fc.oneof(
      fc.constant(undefined),
      fc.constantFrom("", " ", "%20%09"),
      fc.integer({ min: max + 1, max: max + 40 }).map((n) => "Z".repeat(n)),
    );
  // One of mrn or bed is missing, blank or too long.
  const monitorQuery = fc
    .tuple(
      fc.oneof(
        fc.tuple(badField(20), fc.option(mrnOk, { nil: undefined })),
        fc.tuple(fc.option(mrnOk, { nil: undefined }), badField(16)),
      ),
      partial,
    )
    .map(([[mrn, bed], p]) =>
      [
        mrn !== undefined ? `mrn=${mrn}` : "",
        bed !== undefined ? `bed=${bed}` : "",
        p !== undefined ? `partial=${p}` : "",
      ]
        .filter(Boolean)
        .join("&"),
    );
  const tokenBody = route === "hl7" ? body.map((b) => `#${b}`) : body;
  const validToken = fc
    .tuple(
      route === "hl7" ? partial.map((p) => (p === undefined ? "" : `partial=${p}`)) : monitorQuery,
      tokenBody,
    )
    .map(([q, b]) =>
      make(`POST ${path}`, {
        method: "POST",
        path: q ? `${path}?${q}` : path,
        who: "token",
        headers: { "content-type": route === "hl7" ? "x-application/hl7-v2+er7" : "text/csv" },
        body: b,
        write: true,
      }),
    );
  const invalidToken = fc
    .tuple(
      badAuthorization(token),
      body,
      fc.constantFrom<Who>("badToken", "physician"),
      fc.option(fc.constantFrom("mrn=TST1&bed=I01", "partial=accept")),
    )
    .map(([auth, b, who, q]) =>
      make(`POST ${path}`, {
        method: "POST",
        path: q ? `${path}?${q}` : path,
        who,
        headers: auth === undefined ? { origin: ORIGIN } : { origin: ORIGIN, authorization: auth },
        body: b,
        write: true,
      }),
    );
  return fc.oneof({ weight: 3, arbitrary: validToken }, { weight: 2, arbitrary: invalidToken });
}

export type Context = { ids: Ids & ReadIds; specs: BodySpecs; token: string; victimUserId: number };

/** All write routes with their weight in the bulk mix. */
export function writeRoutes(ctx: Context): Record<string, fc.Arbitrary<FuzzCase>> {
  const { ids, specs } = ctx;
  const orderId = idSegment(ids.orders);
  const alertId = idSegment(ids.alerts);
  const importId = idSegment(ids.imports);
  const unitId = idSegment(ids.units);
  // Accounts other tests sign in with are never the target of an account write, even a broken one.
  const userId = fc.oneof(fc.constant(String(ctx.victimUserId)), refusedSegment);
  const at = (prefix: string, seg: fc.Arbitrary<string>, suffix = "") =>
    seg.map((s) => `${prefix}/${s}${suffix}`);
  const fixed = (p: string) => fc.constant(p);
  const order = fc.oneof(refusedBody(specs.writtenOrder), refusedBody(specs.verbalOrder));
  const anyBody = fc.oneof(
    brokenObject(specs.acknowledge).map(toJson),
    randomObject(specs.resolve).map(toJson),
    notAnObject,
    fc.constant(""),
  );
  // No admission id is listed: moves and discharges are refused by body or by a path with no row.
  const admissionId = fc.oneof(refusedSegment, idSegment(ids.patients));
  return {
    "POST /api/v1/admissions": jsonWrite(
      "POST /api/v1/admissions",
      "physician",
      fixed("/api/v1/admissions"),
      refusedBody(specs.admit),
      true,
    ),
    "POST /api/v1/admissions/[admissionId]/transfer": jsonWrite(
      "POST /api/v1/admissions/[admissionId]/transfer",
      "physician",
      at("/api/v1/admissions", admissionId, "/transfer"),
      refusedBody(specs.transfer),
      true,
    ),
    "POST /api/v1/admissions/[admissionId]/discharge": jsonWrite(
      "POST /api/v1/admissions/[admissionId]/discharge",
      "physician",
      at("/api/v1/admissions", admissionId, "/discharge"),
      refusedBody(specs.discharge),
      true,
    ),
    "POST /api/v1/orders": jsonWrite(
      "POST /api/v1/orders",
      "physician",
      fixed("/api/v1/orders"),
      order,
      true,
    ),
    "POST /api/v1/orders/[orderId]/cosign": jsonWrite(
      "POST /api/v1/orders/[orderId]/cosign",
      "physician",
      at("/api/v1/orders", orderId, "/cosign"),
      refusedBody(specs.cosign),
      true,
    ),
    "POST /api/v1/orders/[orderId]/discontinue": jsonWrite(
      "POST /api/v1/orders/[orderId]/discontinue",
      "physician",
      at("/api/v1/orders", orderId, "/discontinue"),
      refusedBody(specs.discontinue),
      true,
    ),
    "POST /api/v1/readings": jsonWrite(
      "POST /api/v1/readings",
      "physician",
      fixed("/api/v1/readings"),
      refusedBody(specs.reading),
      true,
    ),
    "POST /api/v1/blood-gases": jsonWrite(
      "POST /api/v1/blood-gases",
      "physician",
      fixed("/api/v1/blood-gases"),
      refusedBody(specs.bloodGas),
      true,
    ),
    "POST /api/v1/ventilator-checks": jsonWrite(
      "POST /api/v1/ventilator-checks",
      "therapist",
      fixed("/api/v1/ventilator-checks"),
      refusedBody(specs.ventilatorCheck),
      true,
    ),
    "POST /api/v1/patients/[patientId]/height": jsonWrite(
      "POST /api/v1/patients/[patientId]/height",
      "physician",
      at("/api/v1/patients", fc.oneof(refusedSegment, idSegment(ids.patients)), "/height"),
      refusedBody(specs.height),
      true,
    ),
    "POST /api/v1/adjustments": jsonWrite(
      "POST /api/v1/adjustments",
      "physician",
      fixed("/api/v1/adjustments"),
      refusedBody(specs.adjustment),
      true,
    ),
    // An empty or non-object body is a valid acknowledgement (the note is optional): such bodies go to alerts that cannot exist.
    "POST /api/v1/alerts/[alertId]/acknowledge": fc.oneof(
      jsonWrite(
        "POST /api/v1/alerts/[alertId]/acknowledge",
        "physician",
        at("/api/v1/alerts", alertId, "/acknowledge"),
        brokenObject(specs.acknowledge).map(toJson),
      ),
      jsonWrite(
        "POST /api/v1/alerts/[alertId]/acknowledge",
        "physician",
        at("/api/v1/alerts", refusedSegment, "/acknowledge"),
        anyBody,
      ),
    ),
    "POST /api/v1/alerts/[alertId]/resolve": jsonWrite(
      "POST /api/v1/alerts/[alertId]/resolve",
      "physician",
      at("/api/v1/alerts", alertId, "/resolve"),
      refusedBody(specs.resolve),
    ),
    "POST /api/v1/order-requests": jsonWrite(
      "POST /api/v1/order-requests",
      "therapist",
      fixed("/api/v1/order-requests"),
      refusedBody(specs.orderRequest),
      true,
    ),
    "POST /api/v1/order-requests/[requestId]/reply": jsonWrite(
      "POST /api/v1/order-requests/[requestId]/reply",
      "physician",
      at("/api/v1/order-requests", fc.oneof(fc.constant("1"), refusedSegment), "/reply"),
      refusedBody(specs.orderRequestReply),
    ),
    // No body to break: refused only because the order cannot exist.
    "POST /api/v1/orders/[orderId]/read": jsonWrite(
      "POST /api/v1/orders/[orderId]/read",
      "nurse",
      at("/api/v1/orders", refusedSegment, "/read"),
      anyBody,
    ),
    "POST /api/v1/oxygenation/assess": jsonWrite(
      "POST /api/v1/oxygenation/assess",
      "physician",
      fixed("/api/v1/oxygenation/assess"),
      refusedBody(specs.assess),
    ),
    "POST /api/v1/oxygenation/forecast": jsonWrite(
      "POST /api/v1/oxygenation/forecast",
      "physician",
      fixed("/api/v1/oxygenation/forecast"),
      refusedBody(specs.forecast),
    ),
    "POST /api/v1/imports": uploadCase(ids.units),
    // Any mapping is stored on a previewed import: the target is one that cannot exist.
    "PUT /api/v1/imports/[importId]": jsonWrite(
      "PUT /api/v1/imports/[importId]",
      "therapist",
      at("/api/v1/imports", refusedSegment),
      fc.oneof(oddValue.map(toJson), notAnObject),
    ),
    "POST /api/v1/imports/[importId]/confirm": jsonWrite(
      "POST /api/v1/imports/[importId]/confirm",
      "therapist",
      at("/api/v1/imports", importId, "/confirm"),
      refusedBody(specs.confirm),
    ),
    "POST /api/v1/imports/hl7": tokenRoute("hl7", ctx.token),
    "POST /api/v1/imports/monitor": tokenRoute("monitor", ctx.token),
    "POST /api/v1/rehearsals": jsonWrite(
      "POST /api/v1/rehearsals",
      "physician",
      fixed("/api/v1/rehearsals"),
      refusedBody(specs.rehearsal),
    ),
    "POST /api/v1/units": jsonWrite(
      "POST /api/v1/units",
      "admin",
      fixed("/api/v1/units"),
      refusedBody(specs.unitCreate),
    ),
    "PATCH /api/v1/units/[unitId]": jsonWrite(
      "PATCH /api/v1/units/[unitId]",
      "admin",
      at("/api/v1/units", unitId),
      refusedBody(specs.unitUpdate),
    ),
    "POST /api/v1/units/[unitId]/beds": jsonWrite(
      "POST /api/v1/units/[unitId]/beds",
      "admin",
      at("/api/v1/units", unitId, "/beds"),
      refusedBody(specs.bedCreate),
    ),
    "POST /api/v1/units/[unitId]/handoff/acknowledge": jsonWrite(
      "POST /api/v1/units/[unitId]/handoff/acknowledge",
      "nurse",
      at("/api/v1/units", unitId, "/handoff/acknowledge"),
      refusedBody(specs.handoffAcknowledge),
    ),
    // No field is required alone (a label or active), so no random object: each is refusable only when broken.
    "PATCH /api/v1/units/[unitId]/beds/[bedId]": jsonWrite(
      "PATCH /api/v1/units/[unitId]/beds/[bedId]",
      "admin",
      fc
        .tuple(unitId, fc.oneof(fc.integer({ min: 1, max: 40 }).map(String), refusedSegment))
        .map(([u, b]) => `/api/v1/units/${u}/beds/${b}`),
      fc.oneof(
        { weight: 4, arbitrary: brokenObject(specs.bedUpdate).map(toJson) },
        { weight: 1, arbitrary: notAnObject },
      ),
    ),
    "PUT /api/v1/units/[unitId]/assignments": jsonWrite(
      "PUT /api/v1/units/[unitId]/assignments",
      "admin",
      at("/api/v1/units", idSegment(ids.units), "/assignments"),
      refusedBody(specs.assignmentSet),
      true,
    ),
    "POST /api/v1/users": jsonWrite(
      "POST /api/v1/users",
      "admin",
      fixed("/api/v1/users"),
      refusedBody(specs.userCreate),
    ),
    "PATCH /api/v1/users/[userId]": jsonWrite(
      "PATCH /api/v1/users/[userId]",
      "admin",
      at("/api/v1/users", userId),
      refusedBody(specs.userUpdate),
    ),
    "POST /api/v1/users/[userId]/active": jsonWrite(
      "POST /api/v1/users/[userId]/active",
      "admin",
      at("/api/v1/users", userId, "/active"),
      refusedBody(specs.userActive),
    ),
    "POST /api/v1/users/[userId]/invite": jsonWrite(
      "POST /api/v1/users/[userId]/invite",
      "admin",
      at("/api/v1/users", userId, "/invite"),
      refusedBody(specs.invite),
    ),
    "POST /api/v1/me/password": jsonWrite(
      "POST /api/v1/me/password",
      "physician",
      fixed("/api/v1/me/password"),
      refusedBody(specs.passwordChange),
    ),
  };
}

/** Methods a route does not have (405), and paths under /api/v1 that do not exist (404). */
export function strayRequests(): fc.Arbitrary<FuzzCase> {
  return fc
    .tuple(
      fc.constantFrom("DELETE", "PUT", "PATCH", "POST"),
      fc.constantFrom(
        "/api/v1/readings",
        "/api/v1/board",
        "/api/v1/me",
        "/api/v1/ledger",
        "/api/v1/orders/1",
        "/api/v1/users",
        "/api/v1/nothing-here",
        "/api/v1/orders/1/cosign/extra",
      ),
      sessionAccess("physician"),
      notAnObject,
    )
    .filter(
      ([method, path]) =>
        !(method === "POST" && ["/api/v1/readings", "/api/v1/users"].includes(path)),
    )
    .map(([method, path, access, body]) =>
      make(`${method} (no such route)`, {
        method,
        path,
        who: access.who,
        headers: access.headers,
        body: access.noType ? { bytes: body } : body,
        write: true,
      }),
    );
}

import fc from "fast-check";
import { ALERT_KINDS } from "@/lib/alerts/kinds";
import { LEDGER_ACTIONS } from "@/lib/ledger/vocabulary";
import { TIMELINE_KINDS } from "@/lib/chart/timeline";
import { describeCase, type FuzzCase, type Who } from "./case";
import type { Ids } from "./specs";
import { absentId, enc, ODD_TIMES, oddPathSegment, oddQueryValue } from "./values";

/** The GET routes that take path parameters or a query, with odd values for each. */

export type ReadIds = { alerts: number[]; imports: number[]; users: number[] };

const time = fc
  .oneof(
    fc
      .date({ min: new Date("1960-01-01"), max: new Date("2050-01-01"), noInvalidDate: true })
      .map((d) => d.toISOString()),
    fc.constantFrom(...ODD_TIMES),
  )
  .map(enc);
const ids = (xs: number[]) =>
  fc.oneof(
    { weight: 4, arbitrary: fc.constantFrom(...(xs.length ? xs : [1])).map(String) },
    { weight: 1, arbitrary: absentId },
    { weight: 2, arbitrary: oddPathSegment },
  );
const limit = fc.integer({ min: -5, max: 700 }).map(String);
const oneOf = (values: readonly string[]) => fc.constantFrom(...values).map(enc);

/**
 * A query string from a route's keys: known keys with plausible or odd values,
 * unknown keys, repeated keys (the last one counts), `key[]` forms, stray `&` and `=`.
 */
export function queryString(keys: Record<string, fc.Arbitrary<string>>): fc.Arbitrary<string> {
  const names = Object.keys(keys);
  const pair = fc.oneof(
    {
      weight: 8,
      arbitrary: fc
        .constantFrom(...names)
        .chain((k) => fc.oneof(keys[k]!, oddQueryValue).map((v) => `${k}=${v}`)),
    },
    {
      weight: 1,
      arbitrary: fc
        .tuple(fc.string({ maxLength: 8 }).map(enc), oddQueryValue)
        .map(([k, v]) => `${k}=${v}`),
    },
    {
      weight: 1,
      arbitrary: fc
        .constantFrom(...names)
        .chain((k) => fc.constantFrom(k, `${k}=`, `${k}[]=1`, `${k}%00=1`, "&", "=", "==", "%26")),
    },
  );
  return fc.array(pair, { maxLength: 6 }).map((ps) => (ps.length ? `?${ps.join("&")}` : ""));
}

function read(route: string, who: Who, path: fc.Arbitrary<string>): fc.Arbitrary<FuzzCase> {
  return fc
    .tuple(
      path,
      fc.oneof(
        { weight: 9, arbitrary: fc.constant(who) },
        { weight: 1, arbitrary: fc.constant<Who>("anonymous") },
      ),
    )
    .map(([p, w]) => {
      const c: FuzzCase = { route, method: "GET", path: p, who: w, headers: {}, write: false };
      return Object.assign(c, { [fc.toStringMethod]: () => describeCase(c) });
    });
}

const under = (
  prefix: string,
  seg: fc.Arbitrary<string>,
  suffix: string,
  query: fc.Arbitrary<string>,
) => fc.tuple(seg, query).map(([s, q]) => `${prefix}/${s}${suffix}${q}`);

export function parameterisedReads(all: Ids & ReadIds): Record<string, fc.Arbitrary<FuzzCase>> {
  const patient = ids(all.patients);
  const ledgerQuery = queryString({
    patientId: ids(all.patients),
    actorId: ids(all.users),
    action: oneOf(LEDGER_ACTIONS),
    from: time,
    to: time,
    before: ids([1, 10, 100, 1000]),
    limit,
  });
  return {
    "GET /api/v1/alerts": read(
      "GET /api/v1/alerts",
      "physician",
      queryString({
        status: oneOf(["open", "unacknowledged", "resolved", "all"]),
        kind: oneOf(ALERT_KINDS),
        unitId: ids(all.units),
        patientId: ids(all.patients),
        alertId: ids(all.alerts),
        limit,
      }).map((q) => `/api/v1/alerts${q}`),
    ),
    "GET /api/v1/order-requests": read(
      "GET /api/v1/order-requests",
      "therapist",
      queryString({
        status: oneOf(["open", "closed", "all"]),
        patientId: ids(all.patients),
        requestId: ids([1, 2, 3]),
        limit,
      }).map((q) => `/api/v1/order-requests${q}`),
    ),
    // No parameters: unknown keys are ignored.
    "GET /api/v1/me/due": read(
      "GET /api/v1/me/due",
      "nurse",
      fc.constantFrom("", "?status=open", "?x=%00", "?limit=-1").map((q) => `/api/v1/me/due${q}`),
    ),
    "GET /api/v1/rehearsals": read(
      "GET /api/v1/rehearsals",
      "nurse",
      queryString({ unitId: ids(all.units) }).map((q) => `/api/v1/rehearsals${q}`),
    ),
    "GET /api/v1/rehearsals/[rehearsalId]": read(
      "GET /api/v1/rehearsals/[rehearsalId]",
      "nurse",
      ids(all.units).map((id) => `/api/v1/rehearsals/${id}`),
    ),
    "GET /api/v1/board": read(
      "GET /api/v1/board",
      "physician",
      queryString({ unitId: ids(all.units) }).map((q) => `/api/v1/board${q}`),
    ),
    "GET /api/v1/units/[unitId]/handoff": read(
      "GET /api/v1/units/[unitId]/handoff",
      "nurse",
      fc
        .tuple(ids(all.units), queryString({ shift: fc.oneof(oneOf(["next", "current"]), time) }))
        .map(([u, q]) => `/api/v1/units/${u}/handoff${q}`),
    ),
    ...Object.fromEntries(
      (["time-in-band", "alerts", "oxygen-exposure", "orders"] as const).map((kind) => {
        const route = `GET /api/v1/reports/${kind}`;
        return [
          route,
          read(
            route,
            "physician",
            fc
              .oneof(
                queryString({
                  unitId: ids(all.units),
                  from: time,
                  to: time,
                  groupBy: oneOf(["patient", "bed", "shift", "day", "ward"]),
                }),
                // A period the route accepts (to after from, at most 93 days), so the query reaches the database.
                fc
                  .tuple(
                    fc.constantFrom(...(all.units.length ? all.units : [1])),
                    fc.integer({ min: 0, max: 24 * 100 }),
                    fc.integer({ min: -2, max: 24 * 95 }),
                    oneOf(["patient", "bed", "shift", "day"]),
                  )
                  .map(([unitId, ago, hours, groupBy]) => {
                    const from = new Date(Date.now() - ago * 3600_000);
                    const to = new Date(from.getTime() + hours * 3600_000);
                    return `?unitId=${unitId}&from=${enc(from.toISOString())}&to=${enc(to.toISOString())}&groupBy=${groupBy}`;
                  }),
              )
              .map((q) => `/api/v1/reports/${kind}${q}`),
          ),
        ];
      }),
    ),
    "GET /api/v1/ledger": read(
      "GET /api/v1/ledger",
      "physician",
      ledgerQuery.map((q) => `/api/v1/ledger${q}`),
    ),
    "GET /api/v1/orders/[orderId]": read(
      "GET /api/v1/orders/[orderId]",
      "physician",
      under("/api/v1/orders", ids(all.orders), "", queryString({ asOf: time })),
    ),
    "GET /api/v1/patients/[patientId]/bedside": read(
      "GET /api/v1/patients/[patientId]/bedside",
      "physician",
      under(
        "/api/v1/patients",
        patient,
        "/bedside",
        queryString({ useStaleBloodGas: fc.constantFrom("1", "0", "true") }),
      ),
    ),
    "GET /api/v1/patients/[patientId]/timeline": read(
      "GET /api/v1/patients/[patientId]/timeline",
      "physician",
      under(
        "/api/v1/patients",
        patient,
        "/timeline",
        queryString({
          kinds: fc.subarray([...TIMELINE_KINDS, "nope", ""]).map((k) => enc(k.join(","))),
          before: fc.oneof(time, fc.string({ maxLength: 100 }).map(enc)),
          limit,
        }),
      ),
    ),
    "GET /api/v1/ventilator-checks": read(
      "GET /api/v1/ventilator-checks",
      "physician",
      queryString({ patientId: ids(all.patients), limit }).map(
        (q) => `/api/v1/ventilator-checks${q}`,
      ),
    ),
    "GET /api/v1/patients/[patientId]/forecast-accuracy": read(
      "GET /api/v1/patients/[patientId]/forecast-accuracy",
      "physician",
      under("/api/v1/patients", patient, "/forecast-accuracy", fc.constant("")),
    ),
    "GET /api/v1/reports/forecast-accuracy": read(
      "GET /api/v1/reports/forecast-accuracy",
      "physician",
      queryString({ unitId: ids(all.units), from: time, to: time }).map(
        (q) => `/api/v1/reports/forecast-accuracy${q}`,
      ),
    ),
    "GET /api/v1/patients/[patientId]/trend": read(
      "GET /api/v1/patients/[patientId]/trend",
      "physician",
      under(
        "/api/v1/patients",
        patient,
        "/trend",
        fc.oneof(
          queryString({ from: time, to: time }),
          // A range the route accepts (to after from, at most 31 days), so the query reaches the database.
          fc
            .tuple(fc.integer({ min: 0, max: 24 * 40 }), fc.integer({ min: -2, max: 24 * 35 }))
            .map(([ago, hours]) => {
              const from = new Date(Date.now() - ago * 3600_000);
              return `?from=${enc(from.toISOString())}&to=${enc(new Date(from.getTime() + hours * 3600_000).toISOString())}`;
            }),
        ),
      ),
    ),
    "GET /api/v1/imports/[importId]": read(
      "GET /api/v1/imports/[importId]",
      "therapist",
      under("/api/v1/imports", ids(all.imports), "", fc.constant("")),
    ),
    "GET /api/v1/imports/[importId]/report": read(
      "GET /api/v1/imports/[importId]/report",
      "therapist",
      under("/api/v1/imports", ids(all.imports), "/report", fc.constant("")),
    ),
    "GET /api/v1/units/[unitId]/assignments": read(
      "GET /api/v1/units/[unitId]/assignments",
      "physician",
      under(
        "/api/v1/units",
        ids(all.units),
        "/assignments",
        queryString({ shift: fc.oneof(oneOf(["current", "next", "previous"]), time) }),
      ),
    ),
    "GET /api/v1/users/[userId]": read(
      "GET /api/v1/users/[userId]",
      "admin",
      under("/api/v1/users", ids(all.users), "", fc.constant("")),
    ),
  };
}

/**
 * The reads under a per-user quota (lib/rate-limit.ts). The quota is counted
 * before the query is read, so each fuzz user sends fewer than its quota a
 * minute: the odd queries reach validation instead of a 429.
 */
export function quotaReads(all: Ids & ReadIds, who: Who): Record<string, fc.Arbitrary<FuzzCase>> {
  const ledgerQuery = queryString({
    patientId: ids(all.patients),
    action: oneOf(LEDGER_ACTIONS),
    from: time,
    to: time,
    limit,
  });
  return {
    "GET /api/v1/ledger/export": read(
      "GET /api/v1/ledger/export",
      who,
      ledgerQuery.map((q) => `/api/v1/ledger/export${q}`),
    ),
    "GET /api/v1/ledger/verify": read(
      "GET /api/v1/ledger/verify",
      who,
      queryString({ mode: fc.constantFrom("incremental", "full", "FULL", "") }).map(
        (q) => `/api/v1/ledger/verify${q}`,
      ),
    ),
    "GET /api/v1/patients/[patientId]/fhir": read(
      "GET /api/v1/patients/[patientId]/fhir",
      who,
      under(
        "/api/v1/patients",
        ids(all.patients),
        "/fhir",
        queryString({ since: time, download: fc.constantFrom("0", "1", "2", "yes") }),
      ),
    ),
  };
}

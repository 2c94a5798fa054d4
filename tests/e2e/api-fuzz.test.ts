import fc from "fast-check";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDb } from "@/lib/db";
import { appDb } from "../helpers/db";
import type { FuzzCase, Who } from "../helpers/fuzz/case";
import { parameterisedReads, quotaReads } from "../helpers/fuzz/reads";
import { strayRequests, writeRoutes, type Context } from "../helpers/fuzz/routes";
import {
  changed,
  explain,
  inPool,
  send,
  snapshot,
  Tally,
  type Clients,
  type Outcome,
} from "../helpers/fuzz/runner";
import { schemaKeys } from "../helpers/fuzz/bodies";
import { SCHEMAS } from "../helpers/fuzz/specs";
import { fuzzSetup, ownRows, type Accounts } from "../helpers/fuzz/setup";
import { deepRequests, fillLate, lateValues, type Own } from "../helpers/fuzz/deep";
import { BASE_URL } from "../helpers/browser";

/**
 * Fuzz of the HTTP boundary (tests/helpers/fuzz): generated requests to every
 * write route of /api/v1 and every read with a path parameter or a query, as
 * the role allowed to call each (fuzz-only accounts), with our Origin — and a
 * share with no session, another origin, or a body that is not JSON.
 *
 * 1. Bulk (BULK_RUNS batches of BATCH, IN_FLIGHT at a time): every write is
 *    built so that it must be refused — its body breaks its zod schema by
 *    construction (valid-looking fields with one broken, random JSON missing a
 *    required field, or not JSON), or it names no row, or the caller may not
 *    write. Asserted per request: no 5xx and no connection closed without an
 *    answer; every write answered 4xx. Per batch: the row count of each table
 *    the API writes (WATCHED_TABLES: clinical records, the ledger, accounts,
 *    imports) and the ledger's last row are unchanged, reads included.
 * 2. Quota reads (ledger verify/export, FHIR): the same, each fuzz account
 *    kept under its per-minute quota.
 * 3. Sampled (SAMPLED_RUNS, one at a time): valid-looking writes with a field
 *    or two perturbed, aimed at the fuzz's own patient, import and account, so
 *    that many are accepted. Asserted: no 5xx; a refused one (4xx) leaves every
 *    watched table as it was; the oxygenation routes, which store nothing,
 *    change nothing whatever they answer. Accepted writes are counted, not judged.
 *
 * FUZZ_SEED repeats a run; fast-check shrinks a failure to the smallest batch
 * (or request) that still fails.
 */

const SEED = Number(process.env.FUZZ_SEED ?? 20261204);
const BATCH = 200;
/** 50 × 200 = 10,000 bulk requests; `FUZZ_BATCHES` sets another size. */
const BULK_RUNS = Number(process.env.FUZZ_BATCHES ?? 50);
const IN_FLIGHT = 8;
const SAMPLED_RUNS = Number(process.env.FUZZ_SAMPLED ?? 100);

let clients: Clients;
let ctx: Context;
let accounts: Accounts;
const tally = new Tally();
const sampled = new Tally();
const seconds: Record<string, number> = {};
const timed = async (phase: string, run: () => Promise<void>) => {
  const t0 = Date.now();
  try {
    await run();
  } finally {
    seconds[phase] = Math.round((Date.now() - t0) / 100) / 10;
  }
};
const classes = (t: Tally) =>
  Object.entries(t.classes())
    .map(([c, n]) => `${c} ${n}`)
    .join(", ");

beforeAll(async () => {
  ({ clients, ctx, accounts } = await fuzzSetup());
});

afterAll(async () => {
  const routes = new Set(
    [...tally.byRoute.keys(), ...sampled.byRoute.keys()].filter((r) => r.includes("/api/v1/")),
  );
  const phases = Object.entries(seconds)
    .map(([phase, t]) => `${phase} ${t} s`)
    .join(", ");
  const total = tally.total() + sampled.total();
  console.log(
    [
      `API fuzz: seed ${SEED}; ${total} requests over ${routes.size} routes; ${phases}`,
      `Bulk and quota reads: ${tally.total()} requests (${classes(tally)})`,
      tally.table(),
      `Sampled, one at a time: ${sampled.total()} requests (${classes(sampled)})`,
      sampled.table(),
    ].join("\n"),
  );
  await closeDb();
});

/** Sends a batch and returns what is wrong with it: 5xx, a write that was not refused, a table that changed. */
async function problems(batch: FuzzCase[]): Promise<string[]> {
  const before = await snapshot(appDb());
  const outcomes: Outcome[] = await inPool(batch, IN_FLIGHT, (c) => send(c, clients));
  const after = await snapshot(appDb());
  const out: string[] = [];
  for (const o of outcomes) {
    tally.add(o);
    if (o.status >= 500 || o.status === 0) out.push(explain(o, "server error"));
    else if (o.c.write && o.status < 400) out.push(explain(o, "write not refused"));
  }
  const diff = changed(before, after);
  if (diff.length)
    out.push(`rows changed in a batch of refused writes and reads: ${diff.join("; ")}`);
  return out;
}

/** The sampled phase's check of one request, with the watched tables compared around it. */
async function sendAlone(c: FuzzCase, own: Own): Promise<void> {
  const body = typeof c.body === "string" ? c.body : "";
  const values = /__[A-Z_]+__/.test(c.path + body) ? await lateValues(appDb(), own) : null;
  const filled: FuzzCase = values
    ? {
        ...c,
        path: fillLate(c.path, values),
        body: typeof c.body === "string" ? fillLate(c.body, values) : c.body,
      }
    : c;
  const before = await snapshot(appDb());
  const o = await send(filled, clients);
  const diff = changed(before, await snapshot(appDb()));
  sampled.add(o);
  if (o.status >= 500 || o.status === 0) throw new Error(explain(o, "server error"));
  if (o.status >= 400 && diff.length)
    throw new Error(`${explain(o, "refused but wrote")}\n${diff.join("\n")}`);
  if (c.route.includes("/oxygenation/") && diff.length)
    throw new Error(`${explain(o, "stores nothing but wrote")}\n${diff.join("\n")}`);
}

const property = (cases: fc.Arbitrary<FuzzCase>, size: number) =>
  fc.asyncProperty(fc.array(cases, { minLength: size, maxLength: size }), async (batch) => {
    const found = await problems(batch);
    if (found.length)
      throw new Error(`${found.length} problem(s):\n${found.slice(0, 5).join("\n")}`);
  });

describe("API fuzz", () => {
  it("describes every field of each write's zod schema", () => {
    for (const [name, { schema, fromPath = [] }] of Object.entries(SCHEMAS)) {
      const spec = ctx.specs[name as keyof typeof SCHEMAS];
      const keys = schemaKeys(schema).filter((k) => !fromPath.includes(k));
      expect(Object.keys(spec.fields).sort(), name).toEqual(keys);
    }
  });

  it(`refuses ${BULK_RUNS * BATCH} generated writes and odd reads without a 5xx or a changed row`, async () => {
    const writes = writeRoutes(ctx);
    const reads = parameterisedReads(ctx.ids);
    const mix = fc.oneof(
      ...Object.values(writes).map((arbitrary) => ({ weight: 4, arbitrary })),
      ...Object.values(reads).map((arbitrary) => ({ weight: 3, arbitrary })),
      { weight: 1, arbitrary: strayRequests() },
    );
    // No shrinking: each batch already lists its failing requests, and shrinking a
    // batch of HTTP requests re-sends hundreds of batches (past the test's time).
    await timed("bulk", () =>
      fc.assert(property(mix, BATCH), { seed: SEED, numRuns: BULK_RUNS, endOnFailure: true }),
    );
    for (const route of [...Object.keys(writes), ...Object.keys(reads)]) {
      expect(tally.byRoute.get(route)?.size ?? 0, `${route} was never called`).toBeGreaterThan(0);
    }
  }, 900_000);

  it("answers odd queries to the reads under a per-user quota without a 5xx", async () => {
    // Under the quota of each fuzz account (6 verifications, 10 exports, 30 FHIR exports a minute).
    const perUser: [string, number][] = [
      ["GET /api/v1/ledger/verify", 2],
      ["GET /api/v1/ledger/export", 8],
      ["GET /api/v1/patients/[patientId]/fhir", 25],
    ];
    const batches = (["physician", "therapist", "admin", "token"] as Who[]).flatMap((who) => {
      const routes = quotaReads(ctx.ids, who);
      return perUser
        .filter(([route]) => who !== "token" || route.includes("fhir"))
        .map(([route, n]) => property(routes[route]!, n));
    });
    await timed("quota reads", async () => {
      for (const [i, p] of batches.entries())
        await fc.assert(p, { seed: SEED + i, numRuns: 1, endOnFailure: true });
    });
  }, 120_000);

  it(`sends about ${SAMPLED_RUNS} valid-looking writes one at a time: a refused one changes no row`, async () => {
    const own = await ownRows(clients, accounts);
    const routes = deepRequests(ctx.specs, own, new URL(BASE_URL).origin);
    // Each route its share; half as many of those that check a password (bcrypt costs the server most).
    const costly = /orders|users/;
    const unit =
      SAMPLED_RUNS / Object.keys(routes).reduce((n, r) => n + (costly.test(r) ? 1 : 2), 0);
    await timed("sampled", async () => {
      for (const [i, [route, cases]] of Object.entries(routes).entries()) {
        const runs = Math.max(1, Math.round(unit * (costly.test(route) ? 1 : 2)));
        await fc.assert(
          fc.asyncProperty(cases, (c) => sendAlone(c, own)),
          { seed: SEED + i, numRuns: runs },
        );
      }
    });
  }, 300_000);
});

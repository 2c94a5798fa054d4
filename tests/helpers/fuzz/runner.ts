import type { Knex } from "knex";
import { Session } from "../http";
import { describeCase, type FuzzCase, type Who } from "./case";

/** Sending the generated requests, counting rows around them, and the totals. */

export type Clients = { sessions: Partial<Record<Who, Session>>; token: string };
export type Outcome = { c: FuzzCase; status: number; text: string };

function bodyOf(c: FuzzCase): BodyInit | undefined {
  if (c.body === undefined || typeof c.body === "string") return c.body;
  if ("bytes" in c.body) return new TextEncoder().encode(c.body.bytes);
  const form = new FormData();
  for (const p of c.body.parts) {
    if ("value" in p) form.append(p.name, p.value);
    else form.append(p.name, new Blob([p.content]), p.fileName);
  }
  return form;
}

/** Sends one case; a connection that ends without an answer is status 0 (counted as a failure). */
export async function send(c: FuzzCase, clients: Clients): Promise<Outcome> {
  const headers = new Headers(c.headers);
  if (c.who === "token") headers.set("authorization", `Bearer ${clients.token}`);
  const session = clients.sessions[c.who] ?? new Session();
  try {
    const res = await session.fetch(c.path, { method: c.method, headers, body: bodyOf(c) });
    return { c, status: res.status, text: await res.text() };
  } catch (error) {
    return { c, status: 0, text: String((error as Error).cause ?? error) };
  }
}

/** Runs `fn` over `items` with at most `width` in flight; results in input order. */
export async function inPool<T, R>(
  items: readonly T[],
  width: number,
  fn: (t: T) => Promise<R>,
): Promise<R[]> {
  const out = new Array<R>(items.length);
  let next = 0;
  const worker = async () => {
    while (next < items.length) {
      const i = next++;
      out[i] = await fn(items[i]!);
    }
  };
  await Promise.all(Array.from({ length: Math.min(width, items.length) }, worker));
  return out;
}

/**
 * Every table a request to the API can write, clinical records and the ledger
 * among them. Left out: the bookkeeping a refused request writes by design —
 * sign_in_attempts (password checks), request_quotas (per-minute counts),
 * user_sessions (sign-in) — and api_tokens, whose last-used time a token request updates.
 */
export const WATCHED_TABLES = [
  "account_tokens",
  "admissions",
  "adjustments",
  "alert_email_preferences",
  "alert_watches",
  "alerts",
  "api_token_units",
  "beds",
  "bedside_settings",
  "blood_gases",
  "care_assignments",
  "idempotency_keys",
  "imports",
  "ledger_chains",
  "ledger_entries",
  "mail_outbox",
  "order_cosign_notices",
  "order_notices",
  "order_requests",
  "orders",
  "patients",
  "readings",
  "rehearsals",
  "step_table_rows",
  "step_tables",
  "unit_charge_duties",
  "unit_cosigners",
  "units",
  "user_units",
  "users",
  "ventilator_checks",
] as const;

export type Snapshot = Record<string, string>;

let snapshotSql: string | undefined;

/**
 * Row count of each watched table and the ledger's last row, in one query. A
 * count catches a row added or removed; a row changed in place is caught by
 * the ledger, because every accepted write appends its ledger row in the same
 * transaction (and the ledger refuses UPDATE and DELETE). Hashing every row
 * instead costs a full scan of the demo's monitor readings per snapshot, too
 * slow for 100 snapshots in CI.
 */
export async function snapshot(knex: Knex): Promise<Snapshot> {
  snapshotSql ??= `SELECT ${WATCHED_TABLES.map(
    (t) => `(SELECT COUNT(*) FROM \`${t}\`) AS \`${t}\``,
  ).join(
    ", ",
  )}, (SELECT CONCAT(COUNT(*), ' rows, last #', COALESCE(MAX(id), 0)) FROM ledger_entries) AS ledger_last`;
  const [[row]] = (await knex.raw(snapshotSql)) as [[Record<string, string | number>]];
  return Object.fromEntries(Object.entries(row).map(([k, v]) => [k, String(v)]));
}

/** The tables whose rows or checksum differ, as "table: before → after". */
export function changed(before: Snapshot, after: Snapshot): string[] {
  return Object.keys(before)
    .filter((t) => before[t] !== after[t])
    .map((t) => `${t}: ${before[t]} → ${after[t]}`);
}

/** Counts per route and status. */
export class Tally {
  readonly byRoute = new Map<string, Map<number, number>>();

  add(o: Outcome): void {
    const m = this.byRoute.get(o.c.route) ?? new Map<number, number>();
    m.set(o.status, (m.get(o.status) ?? 0) + 1);
    this.byRoute.set(o.c.route, m);
  }

  total(filter: (status: number) => boolean = () => true): number {
    let n = 0;
    for (const m of this.byRoute.values()) for (const [s, k] of m) if (filter(s)) n += k;
    return n;
  }

  classes(): Record<string, number> {
    const out: Record<string, number> = {};
    for (const m of this.byRoute.values())
      for (const [s, k] of m) {
        const c = s === 0 ? "no answer" : `${Math.floor(s / 100)}xx`;
        out[c] = (out[c] ?? 0) + k;
      }
    return out;
  }

  table(): string {
    return [...this.byRoute]
      .sort(([a], [b]) => a.localeCompare(b))
      .map(([route, m]) => {
        const n = [...m.values()].reduce((a, b) => a + b, 0);
        const statuses = [...m]
          .sort(([a], [b]) => a - b)
          .map(([s, k]) => `${s}×${k}`)
          .join(" ");
        return `  ${route.padEnd(46)} ${String(n).padStart(5)}  ${statuses}`;
      })
      .join("\n");
  }
}

/** A failure line: the request, what came back, the first of the body. */
export function explain(o: Outcome, why: string): string {
  return `${why}: ${o.status} for ${describeCase(o.c)} → ${o.text.slice(0, 300)}`;
}

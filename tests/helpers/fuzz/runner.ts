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
  "orders",
  "patients",
  "readings",
  "step_table_rows",
  "step_tables",
  "unit_cosigners",
  "units",
  "user_units",
  "users",
] as const;

export type Snapshot = Record<string, string>;

let snapshotSql: string | undefined;

/**
 * Row count and a hash of every row of each watched table, in one query: a
 * count catches a row added or removed, the hash a row changed. The hash is
 * over the columns as stored (CRC32 of each row, XORed); MariaDB's own CHECKSUM
 * TABLE is not used because it varies on tables with generated columns
 * (admissions, alerts, orders) while nothing writes them.
 */
export async function snapshot(knex: Knex): Promise<Snapshot> {
  if (!snapshotSql) {
    const [columns] = (await knex.raw(
      "SELECT TABLE_NAME AS t, COLUMN_NAME AS c, EXTRA AS e FROM information_schema.COLUMNS WHERE TABLE_SCHEMA = DATABASE() ORDER BY TABLE_NAME, ORDINAL_POSITION",
    )) as [{ t: string; c: string; e: string }[]];
    const stored = (table: string) =>
      columns
        .filter((col) => col.t === table && !/GENERATED|INVISIBLE/i.test(col.e))
        .map((col) => `COALESCE(\`${col.c}\`, 0x00)`);
    snapshotSql = `SELECT ${WATCHED_TABLES.map(
      (t) =>
        `(SELECT CONCAT(COUNT(*), ' rows #', COALESCE(BIT_XOR(CRC32(CONCAT_WS(0x1f, ${stored(t).join(", ")}))), 0)) FROM \`${t}\`) AS \`${t}\``,
    ).join(", ")}`;
  }
  const [[row]] = (await knex.raw(snapshotSql)) as [[Snapshot]];
  return { ...row };
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

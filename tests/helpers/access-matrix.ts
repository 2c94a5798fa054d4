import { can, type Permission } from "@/lib/auth/permissions";
import type { Role } from "@/lib/auth/roles";
import { OTHER, OWN, type UnitCode, type World } from "./access-fixtures";
import { unitPageParams } from "./access-routes-units";
import { Session } from "./http";
import { actionPage, builtAction, callAction } from "./server-actions";

/**
 * One entry of the access matrix: a route handler or a server action, the
 * permission of lib/auth/permissions.ts it requires, and a request that is valid
 * for a record on a given unit — so that whatever refuses it is the access rule.
 *
 * Scope says what "another unit" means for the entry:
 * - "unit": the request names a record (patient, order, alert, import, unit);
 *   another unit's record answers 404.
 * - "list": a list of the caller's units; asked for another unit's record it
 *   answers 200 without it (`shows` tells whether the record came back).
 * - "none": not about one unit's records (accounts, tokens, step-table
 *   administration, one's own settings): own and other collapse into one cell.
 */
export type Scope = "unit" | "list" | "none";
export type Cell = { role: Role | null; unit: UnitCode };

export type RouteCall = {
  path: string;
  method?: string;
  json?: unknown;
  form?: FormData;
  raw?: { body: string; type: string };
  /** The record a list should (or should not) show. */
  marker?: number;
};

type Common = {
  /** "token": only an API token opens it, never a session. */
  permission: Permission | "token";
  /** The table's answer for a role, when it depends on the record too (nurses and devices). */
  allows?: (role: Role) => boolean;
  scope: Scope;
  /** The status of a valid, allowed request. */
  ok: number;
  /**
   * The request does not depend on the role, and its record is costly: the
   * cells the table denies share one per unit (they must leave it as it is; if
   * one changed it, that cell is a leak). Allowed cells always get their own.
   */
  shareWhenDenied?: boolean;
  /** Its allowed cells write orders: run them one at a time (see writeOneAtATime). */
  serial?: boolean;
};
export type RouteEntry = Common & {
  via: "route";
  /** "POST /api/v1/orders/[orderId]/cosign", as the file tree names it. */
  name: string;
  call: (w: World, cell: Cell) => Promise<RouteCall> | RouteCall;
  shows?: (body: string, marker: number) => boolean;
};
export type ActionEntry = Common & {
  via: "action";
  /** The export name. */
  name: string;
  /** The action's one argument, or a promise of it. */
  arg: (w: World, cell: Cell) => unknown;
};
export type Entry = RouteEntry | ActionEntry;

/**
 * Without a session the middleware answers every page path — and so every
 * server action, which is a POST to a page — with a redirect to sign-in
 * before any action code runs. The JSON API answers 401 itself.
 */
export const NO_SESSION_ACTION = "307 → /sign-in";

export type Outcome = string;

export function allows(entry: Entry, role: Role): boolean {
  if (entry.permission === "token") return false;
  return entry.allows ? entry.allows(role) : can({ role }, entry.permission);
}

/** What the table says the cell must answer. */
export function expectedOutcome(entry: Entry, cell: Cell): Outcome {
  if (cell.role === null) return entry.via === "action" ? NO_SESSION_ACTION : "401";
  // A session is no credential on the token routes, whatever the role.
  if (entry.permission === "token") return "401";
  if (!allows(entry, cell.role)) return "403";
  if (cell.unit === OTHER && entry.scope === "unit") return "404";
  if (entry.scope === "list")
    return `${entry.ok} ${cell.unit === OTHER ? "without" : "with"} the record`;
  return String(entry.ok);
}

/** A cell shows access the table denies: a success where it says no, or another unit's record in a list. */
export function isLeak(expected: Outcome, actual: Outcome): boolean {
  const success = (o: Outcome) => /^2\d\d/.test(o);
  if (!success(expected)) return success(actual);
  return expected.endsWith("without the record") && actual.endsWith(" with the record");
}

/** The cells of an entry: every role and no session, on the actor's unit and (when it means something) another. */
export function cellsOf(entry: Entry, roles: readonly Role[], units: readonly UnitCode[]): Cell[] {
  const scoped = entry.scope === "none" ? units.slice(0, 1) : units;
  return scoped.flatMap((unit) => [...roles, null].map((role) => ({ role, unit })));
}

async function routeOutcome(
  entry: RouteEntry,
  session: Session,
  call: RouteCall,
): Promise<Outcome> {
  const method = call.method ?? "GET";
  const res =
    call.json !== undefined
      ? await session.json(call.path, method, call.json)
      : await session.fetch(call.path, {
          method,
          ...(call.form ? { body: call.form } : {}),
          ...(call.raw ? { body: call.raw.body, headers: { "content-type": call.raw.type } } : {}),
        });
  const body = await res.text();
  if (entry.scope !== "list" || res.status !== 200) return String(res.status);
  const seen = entry.shows!(body, call.marker!);
  return `${res.status} ${seen ? "with" : "without"} the record`;
}

type Prepared = RouteCall | { arg: unknown };

async function prepare(w: World, entry: Entry, cell: Cell): Promise<Prepared> {
  if (entry.via === "route") return entry.call(w, cell);
  return { arg: await entry.arg(w, cell) };
}

/** Sends one prepared cell over HTTP, as the cell's role (or with no session). */
async function send(w: World, entry: Entry, cell: Cell, prepared: Prepared): Promise<Outcome> {
  const session = cell.role ? w.actor[cell.role].session : new Session();
  if (entry.via === "route") return routeOutcome(entry, session, prepared as RouteCall);
  const action = builtAction(entry.name);
  // The page only carries the call; the action's argument names the record.
  const own = w.shared[OWN];
  const page = actionPage(action, {
    patientId: own.patientId,
    orderId: own.orderId,
    userId: w.userId,
    tableId: own.stepTableId,
    ...unitPageParams(w),
  });
  const outcome = await callAction(session, action, page, (prepared as { arg: unknown }).arg);
  if (outcome.status >= 300 && outcome.status < 400) {
    return `${outcome.status} → ${new URL(outcome.location ?? "", "http://x").pathname}`;
  }
  return String(outcome.status);
}

/**
 * Runs an entry's cells: first every request is prepared (the records it needs
 * are written), then the cells are sent, `parallel` at a time.
 */
export async function runEntry(
  w: World,
  entry: Entry,
  cells: Cell[],
  parallel: number,
): Promise<Outcome[]> {
  const shared = new Map<UnitCode, Promise<Prepared>>();
  const prepared = await pool(cells, parallel, (cell) => {
    const allowed = /^2/.test(expectedOutcome(entry, cell));
    if (allowed || !entry.shareWhenDenied) return prepare(w, entry, cell);
    if (!shared.has(cell.unit)) shared.set(cell.unit, prepare(w, entry, cell));
    return shared.get(cell.unit)!;
  });
  const indices = cells.map((_, i) => i);
  return pool(indices, entry.serial ? 1 : parallel, (i) => send(w, entry, cells[i]!, prepared[i]!));
}

/** Runs `work` over `items`, at most `limit` at once, keeping the order of the results. */
export async function pool<T, R>(
  items: readonly T[],
  limit: number,
  work: (item: T) => Promise<R>,
): Promise<R[]> {
  const results: R[] = new Array<R>(items.length);
  let next = 0;
  const worker = async () => {
    while (next < items.length) {
      const i = next++;
      results[i] = await work(items[i]!);
    }
  };
  await Promise.all(Array.from({ length: Math.min(limit, items.length) }, worker));
  return results;
}

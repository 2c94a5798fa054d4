import { mkdirSync, readdirSync, readFileSync, writeFileSync } from "node:fs";
import { dirname, join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { ROLES } from "@/lib/auth/roles";
import { closeDb } from "@/lib/db";
import { ACTION_ENTRIES } from "../helpers/access-actions";
import { OTHER, OWN, setUpWorld, type World } from "../helpers/access-fixtures";
import {
  cellsOf,
  expectedOutcome,
  isLeak,
  runEntry,
  type Cell,
  type Entry,
} from "../helpers/access-matrix";
import { ROUTE_ENTRIES } from "../helpers/access-routes";
import { builtActionNames } from "../helpers/server-actions";

// The permission table (lib/auth/permissions.ts) as a test, over HTTP against
// the built app: every /api/v1 route handler and every server action, for
// every role on a record of their own unit and of another unit, and without a
// session. Each cell's expected answer is derived from the table, never
// written down per cell: no session → 401 (a page, so an action: the redirect
// to sign-in), a role the table leaves out → 403, another unit's record → 404,
// otherwise the entry's success status. A leak is a cell that shows access the
// table denies.

const ENTRIES: Entry[] = [...ROUTE_ENTRIES, ...ACTION_ENTRIES];
const UNITS = [OWN, OTHER] as const;
/** Cells of one entry in flight at once: enough to overlap, few enough for two cores. */
const PARALLEL = 4;

function walk(dir: string): string[] {
  return (readdirSync(dir, { recursive: true }) as string[]).map((f) => join(dir, f));
}

/** "POST /api/v1/orders/[orderId]/cosign" for every method a route file exports. */
function routeHandlers(): string[] {
  const root = join(process.cwd(), "app/api/v1");
  return walk(root)
    .filter((f) => f.endsWith("/route.ts"))
    .flatMap((file) => {
      const source = readFileSync(file, "utf8");
      const path = `/api/v1${dirname(file).slice(root.length)}`;
      return [
        ...source.matchAll(
          /export\s+(?:async\s+)?(?:function|const)\s+(GET|POST|PUT|PATCH|DELETE)\b/g,
        ),
      ].map((m) => `${m[1]} ${path}`);
    });
}

/** The exports of every "use server" module under app/ and lib/, wherever the modules live. */
function sourceActions(): string[] {
  return ["app", "lib"]
    .flatMap((d) => walk(join(process.cwd(), d)))
    .filter((f) => /\.tsx?$/.test(f))
    .flatMap((file) => {
      const source = readFileSync(file, "utf8");
      if (!/^\s*["']use server["']/.test(source)) return [];
      return [...source.matchAll(/export\s+(?:async\s+)?(?:function|const)\s+(\w+)/g)].map(
        (m) => m[1]!,
      );
    });
}

const label = (entry: Entry, c: Cell) =>
  `${c.role ?? "no session"}${entry.scope === "none" ? "" : c.unit === OWN ? ", own unit" : ", other unit"}`;

type Row = { entry: string; cell: string; expected: string; actual: string; leak: boolean };
const rows: Row[] = [];
let world: World;
const started = Date.now();

beforeAll(async () => {
  world = await setUpWorld();
});

afterAll(async () => {
  const leaks = rows.filter((r) => r.leak).length;
  const figure = `${rows.length} cells, ${leaks} leaks`;
  const seconds = ((Date.now() - started) / 1000).toFixed(1);
  console.log(`access matrix: ${figure} (${seconds} s)`);
  mkdirSync(join(process.cwd(), "tests/artifacts"), { recursive: true });
  writeFileSync(
    join(process.cwd(), "tests/artifacts/access-matrix.txt"),
    [
      figure,
      ...rows.map(
        (r) =>
          `${r.leak ? "LEAK " : ""}${r.entry} | ${r.cell} | expected ${r.expected} | got ${r.actual}`,
      ),
    ].join("\n") + "\n",
  );
  await closeDb();
});

describe("access matrix", () => {
  it("has one entry for every /api/v1 route handler and every server action", () => {
    const sorted = (xs: string[]) => [...xs].sort();
    expect(sorted(ROUTE_ENTRIES.map((e) => e.name))).toEqual(sorted(routeHandlers()));
    const built = builtActionNames();
    expect(sorted(sourceActions())).toEqual(sorted(built));
    expect(sorted(ACTION_ENTRIES.map((e) => e.name))).toEqual(sorted(built));
  });

  for (const entry of ENTRIES) {
    it(`${entry.via === "action" ? "action " : ""}${entry.name} (${entry.permission})`, async () => {
      const cells = cellsOf(entry, ROLES, UNITS);
      const actual = await runEntry(world, entry, cells, PARALLEL);
      const expected = cells.map((c) => expectedOutcome(entry, c));
      cells.forEach((c, i) =>
        rows.push({
          entry: entry.name,
          cell: label(entry, c),
          expected: expected[i]!,
          actual: actual[i]!,
          leak: isLeak(expected[i]!, actual[i]!),
        }),
      );
      const table = (outcomes: string[]) =>
        Object.fromEntries(cells.map((c, i) => [label(entry, c), outcomes[i]]));
      expect(table(actual)).toEqual(table(expected));
    });
  }

  it("finds no leak in any cell", () => {
    expect(rows.length).toBe(ENTRIES.reduce((n, e) => n + cellsOf(e, ROLES, UNITS).length, 0));
    expect(rows.filter((r) => r.leak)).toEqual([]);
  });
});

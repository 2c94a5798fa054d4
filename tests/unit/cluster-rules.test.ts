import { readFileSync, readdirSync, statSync } from "node:fs";
import path from "node:path";
import { describe, expect, it } from "vitest";

// Galera replicates row changes only: named locks (GET_LOCK), LOCK TABLES and
// sequences other than auto-increment would hold on one node and silently not
// on the others. The code and migrations must not use them.
const ROOT = path.resolve(__dirname, "../..");
const FORBIDDEN = /\b(GET_LOCK|RELEASE_LOCK|LOCK\s+TABLES?|CREATE\s+SEQUENCE|NEXTVAL)\b/i;

function sources(dir: string): string[] {
  return readdirSync(dir).flatMap((name) => {
    const full = path.join(dir, name);
    if (statSync(full).isDirectory()) return sources(full);
    return /\.(ts|tsx|sh)$/.test(name) ? [full] : [];
  });
}

describe("constructs a multi-primary cluster does not replicate", () => {
  it("appear nowhere in the app, the libraries or the migrations", () => {
    const files = ["app", "lib", "db"].flatMap((d) => sources(path.join(ROOT, d)));
    expect(files.length).toBeGreaterThan(100);
    const hits = files.filter((f) => FORBIDDEN.test(readFileSync(f, "utf8")));
    expect(hits.map((f) => path.relative(ROOT, f))).toEqual([]);
  });
});

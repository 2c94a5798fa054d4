import { readFileSync, readdirSync, statSync } from "node:fs";
import path from "node:path";
import { describe, expect, it } from "vitest";

// PaO2, PAO2, SpO2, FiO2, A–a and a/A mean different things in different case:
// no screen may transform their case. The one exception is the unit-code input,
// whose codes are capitals by rule.
const ROOT = path.resolve(__dirname, "../..");
const EXCEPTIONS = new Set(["components/units/UnitForm.tsx"]);

function tsx(dir: string): string[] {
  return readdirSync(dir).flatMap((name) => {
    const full = path.join(dir, name);
    if (statSync(full).isDirectory()) return tsx(full);
    return name.endsWith(".tsx") ? [full] : [];
  });
}

describe("clinical abbreviations keep their case", () => {
  it("no component or page applies an uppercase transform", () => {
    const files = ["components", "app"].flatMap((d) => tsx(path.join(ROOT, d)));
    expect(files.length).toBeGreaterThan(50);
    const offenders = files
      .map((f) => path.relative(ROOT, f))
      .filter((f) => !EXCEPTIONS.has(f))
      .filter((f) => /\buppercase\b|text-transform/.test(readFileSync(path.join(ROOT, f), "utf8")));
    expect(offenders).toEqual([]);
  });
});

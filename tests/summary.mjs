// Adds up vitest's JSON reports and the plain checks (type-check, lint, build)
// into the one closing line "N passed, N failed"; exits non-zero on any failure.
import { readdirSync, readFileSync } from "node:fs";
import { join } from "node:path";

const dir = process.argv[2];
let passed = 0;
let failed = 0;
const failures = [];
for (const file of readdirSync(dir).sort()) {
  if (!file.endsWith(".json")) continue;
  const data = JSON.parse(readFileSync(join(dir, file), "utf8"));
  if (file.startsWith("check-")) {
    if (data.ok) passed += 1;
    else {
      failed += 1;
      failures.push(data.name);
    }
  } else if (file.startsWith("vitest-")) {
    passed += data.numPassedTests;
    failed += data.numFailedTests;
    // A file that fails to load, or in a hook, has no failed test but still fails the run.
    for (const suite of data.testResults ?? []) {
      const failedInside = (suite.assertionResults ?? []).some((t) => t.status === "failed");
      if (suite.status === "failed" && !failedInside) {
        failed += 1;
        failures.push(suite.name);
      }
    }
    for (const suite of data.testResults ?? []) {
      for (const t of suite.assertionResults ?? []) {
        if (t.status === "failed") failures.push(`${t.fullName}`);
      }
    }
  }
}
if (failures.length) console.log(`\nFailed:\n  ${failures.join("\n  ")}`);
console.log(`\n${passed} passed, ${failed} failed`);
process.exit(failed === 0 && passed > 0 ? 0 : 1);

/**
 * `npm run rollups:rebuild -- [--from ISO] [--to ISO] [--if-empty]`: recomputes the SpO2 and
 * FiO2 rollups of every admission over the period from the raw rows (default:
 * the last 30 days to 4 h ahead, as far as a charted value can hold). The
 * services keep the rollups on every write; this is for repair, for rows
 * written by hand, and after a change to the rules.
 */
import { parseArgs } from "node:util";
import "../../lib/local-env";
import { closeDb, db } from "../../lib/db";
import { rebuildRollups } from "../../lib/rollups/store";
import { MAX_CARRY_FORWARD_MS } from "../../lib/time-in-band";

function dateArg(name: string, value: string | undefined, fallback: Date): Date {
  if (value === undefined) return fallback;
  const d = new Date(value);
  if (Number.isNaN(d.getTime()))
    throw new Error(`--${name} must be an ISO 8601 date and time, got "${value}".`);
  return d;
}

async function main() {
  const { values } = parseArgs({
    options: {
      from: { type: "string" },
      to: { type: "string" },
      "if-empty": { type: "boolean", default: false },
    },
  });
  if (values["if-empty"]) {
    const [[row]] = (await db().raw(
      "SELECT EXISTS(SELECT 1 FROM rollup_minutes) AS kept, EXISTS(SELECT 1 FROM readings) AS readings",
    )) as [[{ kept: number; readings: number }]];
    if (row!.kept || !row!.readings) return;
  }
  const now = Date.now();
  const from = dateArg("from", values.from, new Date(now - 30 * 24 * 3600_000));
  const to = dateArg("to", values.to, new Date(now + MAX_CARRY_FORWARD_MS));
  if (to <= from) throw new Error("--to must be after --from.");
  const started = performance.now();
  const { admissions } = await rebuildRollups(db(), { from, to });
  console.log(
    `[rollups] rebuilt ${admissions} admissions over ${from.toISOString()} … ${to.toISOString()} in ${Math.round(performance.now() - started)} ms`,
  );
}

main()
  .catch((error: unknown) => {
    console.error(error instanceof Error ? error.message : error);
    process.exitCode = 1;
  })
  .finally(() => void closeDb());

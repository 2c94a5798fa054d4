import Papa from "papaparse";
import { unitClock } from "../reports/csv";
import { cohortWords } from "./labels";
import type { RehearsalTable } from "./tables";
import type { RehearsalView } from "./views";

/**
 * A rehearsal's table as CSV, as the Reports page writes its own: a first
 * line naming the table and the run (name, number, unit, seed, cohort and when
 * it was asked for, on the unit's clock; two runs as A and B), then the
 * column header and the rows.
 * Numbers are written as stored (no thousands separators, a point for
 * decimals); an empty value is an empty field; text a spreadsheet would run as
 * a formula is defused by papaparse's escapeFormulae. Pure: the download
 * button calls it in the browser.
 */

export type CsvRun = Pick<RehearsalView, "id" | "label" | "unitCode" | "settings" | "createdAt">;

/** "Run #12 “Lower PEEP”, MICU, seed 42, 12 patients × 24 h, asked for 2026-12-03 09:15 (Europe/Oslo)". */
export function runLine(run: CsvRun, timeZone: string): string {
  return `Run #${run.id} “${run.label}”, ${run.unitCode}, seed ${run.settings.seed}, ${cohortWords(run.settings)}, asked for ${unitClock(run.createdAt, timeZone)} (${timeZone})`;
}

const OPTIONS = { escapeFormulae: true, newline: "\r\n" } as const;

/** The table's CSV after a heading line naming the table and each run it comes from. */
export function rehearsalCsv(
  table: RehearsalTable,
  runs: readonly CsvRun[],
  timeZone: string,
): string {
  const letter = (i: number) => (runs.length > 1 ? `${String.fromCharCode(65 + i)}: ` : "");
  const named = runs.map((r, i) => `${letter(i)}${runLine(r, timeZone)}`).join("; ");
  const heading = `Protocol rehearsal: ${table.title}; ${named}`;
  const body = Papa.unparse(
    {
      fields: table.columns.map((c) => c.label),
      data: table.rows.map((r) => r.cells.map((c) => (c === null ? "" : c))),
    },
    OPTIONS,
  );
  return `${Papa.unparse([[heading]], OPTIONS)}\r\n${body}\r\n`;
}

/** "rehearsal-12-models.csv"; two runs: "rehearsal-12-vs-14-compare.csv". */
export function rehearsalCsvFileName(
  table: Pick<RehearsalTable, "id">,
  runs: readonly Pick<RehearsalView, "id">[],
): string {
  const ids = runs.map((r) => r.id).join("-vs-");
  return `rehearsal-${ids}-${table.id}.csv`.replace(/[^A-Za-z0-9._-]+/g, "-");
}

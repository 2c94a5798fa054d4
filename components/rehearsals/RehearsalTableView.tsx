"use client";

import type { ReactNode } from "react";
import { DataTable } from "@/components/ui/DataTable";
import { DownloadCsvButton } from "@/components/ui/DownloadCsvButton";
import { rehearsalCsv, rehearsalCsvFileName, type CsvRun } from "@/lib/rehearsal/csv";
import { cellText, type RehearsalTable } from "@/lib/rehearsal/tables";

/** A rehearsal table's CSV (lib/rehearsal/csv.ts), built in the browser. */
export function RehearsalCsvButton({
  table,
  runs,
  timeZone,
}: {
  table: RehearsalTable;
  runs: readonly CsvRun[];
  timeZone: string;
}) {
  return (
    <DownloadCsvButton
      build={() => rehearsalCsv(table, runs, timeZone)}
      fileName={rehearsalCsvFileName(table, runs)}
      label={`Download CSV: ${table.title}${runs.length === 1 ? `, run #${runs[0]!.id}` : ""}`}
    />
  );
}

/** One table of a run (or of two runs side by side) with its CSV download. */
export function RehearsalTableView({
  table,
  runs,
  timeZone,
  caption,
  note,
  headingLevel = 3,
  compact = false,
}: {
  table: RehearsalTable;
  runs: readonly CsvRun[];
  timeZone: string;
  /** The table's caption for screen readers (what it is, for which run). */
  caption: string;
  note?: ReactNode;
  headingLevel?: 3 | 4;
  /** Smaller type and padding on a phone, so a narrow table fits without scrolling. */
  compact?: boolean;
}) {
  return (
    <DataTable
      id={`${table.id}-${runs.map((r) => r.id).join("-")}`}
      testId={`rehearsal-table-${table.id}`}
      title={table.title}
      headingLevel={headingLevel}
      actions={<RehearsalCsvButton table={table} runs={runs} timeZone={timeZone} />}
      note={note}
      caption={caption}
      columns={table.columns.map((c) => ({ ...c, numeric: c.format !== "text" }))}
      rows={table.rows.map((row) => ({
        key: row.key,
        cells: table.columns.map((_, i) => cellText(table, row, i)),
      }))}
      emptyText="Nothing to show."
      compact={compact}
    />
  );
}

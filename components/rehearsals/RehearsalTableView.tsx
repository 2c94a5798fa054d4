"use client";

import type { ReactNode } from "react";
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
  const cell = compact ? "px-1.5 py-1 sm:px-2 sm:py-1.5" : "px-2 py-1.5";
  const headingId = `${table.id}-${runs.map((r) => r.id).join("-")}-heading`;
  const Heading = headingLevel === 3 ? "h3" : "h4";
  return (
    <section
      aria-labelledby={headingId}
      className="min-w-0 space-y-2"
      data-testid={`rehearsal-table-${table.id}`}
    >
      <div className="flex flex-wrap items-center justify-between gap-2">
        <Heading id={headingId} className="text-base font-semibold">
          {table.title}
        </Heading>
        {table.rows.length > 0 ? (
          <RehearsalCsvButton table={table} runs={runs} timeZone={timeZone} />
        ) : null}
      </div>
      {note ? <p className="text-xs text-ink-muted">{note}</p> : null}
      {table.rows.length === 0 ? (
        <p className="rounded-md border border-dashed border-border-strong px-3 py-4 text-sm text-ink-muted">
          Nothing to show.
        </p>
      ) : (
        <div className="overflow-x-auto rounded-card border border-border bg-surface print:overflow-visible">
          <table className={`w-full ${compact ? "text-xs sm:text-sm" : "text-sm"}`}>
            <caption className="sr-only">{caption}</caption>
            <thead className="bg-surface-muted text-left text-xs text-ink-muted">
              <tr>
                {table.columns.map((c, i) => (
                  <th
                    key={c.key}
                    scope="col"
                    className={`${cell} font-semibold ${i > 0 && c.format !== "text" ? "text-right" : ""}`}
                  >
                    {c.label}
                  </th>
                ))}
              </tr>
            </thead>
            <tbody>
              {table.rows.map((row) => (
                <tr key={row.key} className="border-t border-border">
                  {table.columns.map((column, i) =>
                    i === 0 ? (
                      <th key={column.key} scope="row" className={`${cell} text-left font-medium`}>
                        {cellText(table, row, i)}
                      </th>
                    ) : (
                      <td
                        key={column.key}
                        className={`tabular ${cell} ${column.format !== "text" ? "text-right" : ""}`}
                      >
                        {cellText(table, row, i)}
                      </td>
                    ),
                  )}
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      )}
    </section>
  );
}

import type { ReactNode } from "react";

/** A column: its key, header, and whether it holds numbers (right-aligned, tabular). */
export type DataColumn = { key: string; label: string; numeric: boolean };
/** A row: the first cell is the row's header. */
export type DataRow = { key: string; cells: ReactNode[] };

/**
 * A titled table with its download button, or a dashed note when there is
 * nothing to show. One look for every table of the reports and rehearsals.
 */
export function DataTable({
  id,
  testId,
  title,
  headingLevel = 3,
  actions,
  note,
  caption,
  columns,
  rows,
  emptyText,
  compact = false,
}: {
  id: string;
  testId: string;
  title: string;
  headingLevel?: 3 | 4;
  /** Shown beside the title when there are rows (the CSV button). */
  actions?: ReactNode;
  note?: ReactNode;
  /** For screen readers: what the table is, for which unit or run. */
  caption: string;
  columns: readonly DataColumn[];
  rows: readonly DataRow[];
  emptyText: string;
  /** Smaller type and padding on a phone, so a narrow table fits without scrolling. */
  compact?: boolean;
}) {
  const cell = compact ? "px-1.5 py-1 sm:px-2 sm:py-1.5" : "px-2 py-1.5";
  const headingId = `${id}-heading`;
  const Heading = headingLevel === 3 ? "h3" : "h4";
  return (
    <section aria-labelledby={headingId} className="min-w-0 space-y-2" data-testid={testId}>
      <div className="flex flex-wrap items-center justify-between gap-2">
        <Heading id={headingId} className="text-base font-semibold">
          {title}
        </Heading>
        {rows.length > 0 ? actions : null}
      </div>
      {note ? <p className="text-xs text-ink-muted">{note}</p> : null}
      {rows.length === 0 ? (
        <p className="rounded-md border border-dashed border-border-strong px-3 py-4 text-sm text-ink-muted">
          {emptyText}
        </p>
      ) : (
        <div className="overflow-x-auto rounded-card border border-border bg-surface print:overflow-visible">
          <table className={`w-full ${compact ? "text-xs sm:text-sm" : "text-sm"}`}>
            <caption className="sr-only">{caption}</caption>
            <thead className="bg-surface-muted text-left text-xs text-ink-muted">
              <tr>
                {columns.map((c, i) => (
                  <th
                    key={c.key}
                    scope="col"
                    className={`${cell} font-semibold ${i > 0 && c.numeric ? "text-right" : ""}`}
                  >
                    {c.label}
                  </th>
                ))}
              </tr>
            </thead>
            <tbody>
              {rows.map((row) => (
                <tr key={row.key} className="border-t border-border">
                  {columns.map((column, i) =>
                    i === 0 ? (
                      <th key={column.key} scope="row" className={`${cell} text-left font-medium`}>
                        {row.cells[0]}
                      </th>
                    ) : (
                      <td
                        key={column.key}
                        className={`tabular ${cell} ${column.numeric ? "text-right" : ""}`}
                      >
                        {row.cells[i]}
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

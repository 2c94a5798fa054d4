import Link from "next/link";
import { formatCell, type ReportTable } from "@/lib/reports/tables";
import type { ReportPeriod } from "@/lib/reports/types";
import { CsvDownload } from "./CsvDownload";

/** One table of a report with its CSV download; patient rows link to the Chart. */
export function ReportTableView({
  table,
  period,
  reportLabel,
  emptyText = "Nothing in this period.",
}: {
  table: ReportTable;
  period: ReportPeriod;
  reportLabel: string;
  emptyText?: string;
}) {
  const headingId = `${table.id}-heading`;
  return (
    <section aria-labelledby={headingId} className="space-y-2" data-testid={`table-${table.id}`}>
      <div className="flex flex-wrap items-center justify-between gap-2">
        <h3 id={headingId} className="text-base font-semibold">
          {table.title}
        </h3>
        {table.rows.length > 0 ? (
          <CsvDownload table={table} period={period} reportLabel={reportLabel} />
        ) : null}
      </div>
      {table.rows.length === 0 ? (
        <p className="rounded-md border border-dashed border-border-strong px-3 py-4 text-sm text-ink-muted">
          {emptyText}
        </p>
      ) : (
        <div className="overflow-x-auto rounded-card border border-border bg-surface print:overflow-visible">
          <table className="w-full text-sm">
            <caption className="sr-only">
              {table.title}, {period.unitCode}
            </caption>
            <thead className="bg-surface-muted text-left text-xs text-ink-muted">
              <tr>
                {table.columns.map((c, i) => (
                  <th
                    key={c.key}
                    scope="col"
                    className={`px-2 py-1.5 font-semibold ${i > 0 && c.format !== "text" ? "text-right" : ""}`}
                  >
                    {c.label}
                  </th>
                ))}
              </tr>
            </thead>
            <tbody>
              {table.rows.map((row) => (
                <tr key={row.key} className="border-t border-border">
                  {row.cells.map((cell, i) => {
                    const column = table.columns[i]!;
                    const text = formatCell(cell, column.format);
                    if (i === 0)
                      return (
                        <th
                          key={column.key}
                          scope="row"
                          className="px-2 py-1.5 text-left font-medium"
                        >
                          {row.patientId !== undefined ? (
                            <Link
                              className="text-accent underline"
                              href={`/patients/${row.patientId}`}
                            >
                              {text}
                            </Link>
                          ) : (
                            text
                          )}
                        </th>
                      );
                    return (
                      <td
                        key={column.key}
                        className={`px-2 py-1.5 ${column.format !== "text" ? "text-right" : ""}`}
                      >
                        {text}
                      </td>
                    );
                  })}
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      )}
    </section>
  );
}

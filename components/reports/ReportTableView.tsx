import Link from "next/link";
import { DataTable } from "@/components/ui/DataTable";
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
  return (
    <DataTable
      id={table.id}
      testId={`table-${table.id}`}
      title={table.title}
      actions={<CsvDownload table={table} period={period} reportLabel={reportLabel} />}
      caption={`${table.title}, ${period.unitCode}`}
      columns={table.columns.map((c) => ({ ...c, numeric: c.format !== "text" }))}
      rows={table.rows.map((row) => ({
        key: row.key,
        cells: row.cells.map((value, i) => {
          const text = formatCell(value, table.columns[i]!.format);
          return i === 0 && row.patientId !== undefined ? (
            <Link className="text-accent underline" href={`/patients/${row.patientId}`}>
              {text}
            </Link>
          ) : (
            text
          );
        }),
      }))}
      emptyText={emptyText}
    />
  );
}

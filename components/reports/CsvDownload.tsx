"use client";

import { DownloadCsvButton } from "@/components/ui/DownloadCsvButton";
import { csvFileName, tableToCsv } from "@/lib/reports/csv";
import type { ReportTable } from "@/lib/reports/tables";
import type { ReportPeriod } from "@/lib/reports/types";

/** A report table's CSV (lib/reports/csv.ts), built in the browser. */
export function CsvDownload({
  table,
  period,
  reportLabel,
}: {
  table: ReportTable;
  period: ReportPeriod;
  reportLabel: string;
}) {
  return (
    <DownloadCsvButton
      build={() => tableToCsv(table, period, reportLabel)}
      fileName={csvFileName(table, period)}
      label={`Download CSV: ${table.title}`}
    />
  );
}

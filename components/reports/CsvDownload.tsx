"use client";

import { buttonClasses } from "@/components/ui/Button";
import { csvFileName, tableToCsv } from "@/lib/reports/csv";
import type { ReportTable } from "@/lib/reports/tables";
import type { ReportPeriod } from "@/lib/reports/types";

/** Builds the table's CSV in the browser (lib/reports/csv.ts) and saves it through a Blob link. */
export function CsvDownload({
  table,
  period,
  reportLabel,
}: {
  table: ReportTable;
  period: ReportPeriod;
  reportLabel: string;
}) {
  const download = () => {
    const blob = new Blob([tableToCsv(table, period, reportLabel)], {
      type: "text/csv;charset=utf-8",
    });
    const url = URL.createObjectURL(blob);
    const a = document.createElement("a");
    a.href = url;
    a.download = csvFileName(table, period);
    document.body.appendChild(a);
    a.click();
    a.remove();
    setTimeout(() => URL.revokeObjectURL(url), 1000);
  };
  return (
    <button
      type="button"
      onClick={download}
      className={buttonClasses("secondary", "print:hidden")}
      aria-label={`Download CSV: ${table.title}`}
    >
      Download CSV
    </button>
  );
}

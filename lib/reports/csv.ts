import Papa from "papaparse";
import type { ReportPeriod } from "./types";
import type { ReportTable } from "./tables";

/**
 * One table of a report as CSV: a first line naming the report, the unit and
 * the period (on the unit's clock, with its zone) and when it was generated,
 * then the column header and the rows. Numbers are written as the page shows
 * them, without thousands separators; an empty value is an empty field. Text
 * that a spreadsheet would run as a formula (=, +, -, @ …) is quoted and
 * prefixed with ' by papaparse's escapeFormulae. Pure: the page's download
 * button calls it in the browser.
 */

export function unitClock(iso: string, timeZone: string): string {
  const parts = new Intl.DateTimeFormat("en-CA", {
    timeZone,
    year: "numeric",
    month: "2-digit",
    day: "2-digit",
    hour: "2-digit",
    minute: "2-digit",
    hourCycle: "h23",
  }).formatToParts(new Date(iso));
  const get = (t: Intl.DateTimeFormatPartTypes) => parts.find((p) => p.type === t)?.value ?? "";
  return `${get("year")}-${get("month")}-${get("day")} ${get("hour")}:${get("minute")}`;
}

/** "MICU (Medical ICU), 2026-11-26 07:00 to 2026-12-03 07:00 (Europe/Oslo)". */
export function periodLine(period: ReportPeriod): string {
  return `${period.unitCode} (${period.unitName}), ${unitClock(period.from, period.timeZone)} to ${unitClock(period.to, period.timeZone)} (${period.timeZone})`;
}

export function tableToCsv(table: ReportTable, period: ReportPeriod, reportLabel: string): string {
  const heading = `${reportLabel}: ${table.title}, ${periodLine(period)}, generated ${unitClock(period.generatedAt, period.timeZone)}`;
  const body = Papa.unparse(
    {
      fields: table.columns.map((c) => c.label),
      data: table.rows.map((r) => r.cells.map((c) => (c === null ? "" : c))),
    },
    { escapeFormulae: true, newline: "\r\n" },
  );
  return `${Papa.unparse([[heading]], { escapeFormulae: true, newline: "\r\n" })}\r\n${body}\r\n`;
}

/** A file name for the download: report, table, unit and first day. */
export function csvFileName(table: ReportTable, period: ReportPeriod): string {
  const day = unitClock(period.from, period.timeZone).slice(0, 10);
  return `tidemark-${table.id}-${period.unitCode}-${day}.csv`.replace(/[^A-Za-z0-9._-]+/g, "-");
}

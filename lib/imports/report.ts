import type { BloodGasMapping } from "./csv";
import type { ImportKind, ImportStatus, RejectedRow } from "./kinds";

// What a person sees of an import: counts, the first accepted rows, every
// rejected row with its reasons. Pure, so the CSV download is unit-tested.

export type AcceptedRowView = {
  label: string;
  mrn: string;
  patient: string;
  what: "blood gas" | "reading";
  at: string;
  summary: string;
};

export type StoredReport = {
  rejected: RejectedRow[];
  sample: AcceptedRowView[];
  notes: string[];
  header?: string[];
  mapping?: BloodGasMapping;
  /** The mapping step is incomplete: nothing can be checked until it is. */
  mappingErrors?: Record<string, string[]>;
};

export type ImportPreview = {
  id: number;
  kind: ImportKind;
  status: ImportStatus;
  unitId: number;
  unitCode: string;
  fileName: string;
  sha256: string;
  byteSize: number;
  createdAt: string;
  importedAt: string | null;
  counts: { total: number; accepted: number; rejected: number };
  monitor: { mrn: string; bed: string } | null;
  /** True when this upload matched a file or message that was imported before: nothing changed. */
  alreadyImported: boolean;
} & StoredReport;

export const SAMPLE_ROWS = 20;

const csvCell = (v: string | number | null | undefined) => {
  const s = v === null || v === undefined ? "" : String(v);
  // Leading = + - @ would be formulas in a spreadsheet: prefix them.
  const safe = /^[=+\-@]/.test(s) ? `'${s}` : s;
  return /[",\r\n]/.test(safe) ? `"${safe.replace(/"/g, '""')}"` : safe;
};

/** The import report as CSV: one line per reason of every rejected row. */
export function reportToCsv(
  preview: Pick<
    ImportPreview,
    "id" | "fileName" | "sha256" | "status" | "counts" | "rejected" | "notes"
  >,
): string {
  const lines = [
    ["import", "file", "sha256", "status", "rows", "accepted", "rejected"].join(","),
    [
      preview.id,
      csvCell(preview.fileName),
      preview.sha256,
      preview.status,
      preview.counts.total,
      preview.counts.accepted,
      preview.counts.rejected,
    ].join(","),
    "",
    ["row", "line", "mrn", "reason", "field", "message"].join(","),
  ];
  for (const r of preview.rejected) {
    for (const reason of r.reasons) {
      lines.push(
        [
          csvCell(r.label),
          r.line,
          csvCell(r.mrn),
          reason.code,
          csvCell(reason.field),
          csvCell(reason.message),
        ].join(","),
      );
    }
  }
  for (const note of preview.notes) lines.push(["note", "", "", "", "", csvCell(note)].join(","));
  return `${lines.join("\r\n")}\r\n`;
}

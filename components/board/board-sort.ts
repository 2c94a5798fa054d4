import type { BoardRow } from "@/lib/board/queries";

export type SortKey =
  "bed" | "patient" | "device" | "fio2" | "spo2" | "timeInBand" | "pf" | "reassessed";
export type SortState = { key: SortKey; direction: "asc" | "desc" };
export type StatusFilter =
  "all" | "in-band" | "below" | "above" | "overdue" | "awaiting-cosign" | "no-order";

export const STATUS_FILTERS: { value: StatusFilter; label: string }[] = [
  { value: "all", label: "Any status" },
  { value: "in-band", label: "In band" },
  { value: "below", label: "Below band" },
  { value: "above", label: "Above band on O₂" },
  { value: "overdue", label: "Reassessment overdue" },
  { value: "awaiting-cosign", label: "Awaiting co-sign" },
  { value: "no-order", label: "No order" },
];

/** Whether a row shows the given status (the Board's status filter). */
export function matchesStatus(row: BoardRow, status: StatusFilter): boolean {
  switch (status) {
    case "all":
      return true;
    case "in-band":
    case "below":
    case "above":
      return row.spo2Status === status;
    case "overdue":
      return row.overdue;
    case "awaiting-cosign":
      return row.order?.status === "awaiting_cosign";
    case "no-order":
      return row.order === null;
  }
}

// Missing values sort last whatever the direction, so empty rows never lead.
function value(row: BoardRow, key: SortKey): number | string | null {
  switch (key) {
    case "bed":
      return null; // the server's bed order, handled by the tie-break
    case "patient":
      return row.patientInitials;
    case "device":
      return row.deviceLabel;
    case "fio2":
      return row.fio2;
    case "spo2":
      return row.latestSpo2?.pct ?? null;
    case "timeInBand":
      return row.order ? row.timeInBand24h.inBand : null;
    case "pf":
      return row.latestPf?.ratio ?? null;
    case "reassessed":
      return row.minutesSinceReassessment;
  }
}

/**
 * Rows sorted by the chosen column; ties keep the server's bed order, so a
 * refresh that changes no sorted value never moves a row.
 */
export function sortRows(rows: readonly BoardRow[], sort: SortState): BoardRow[] {
  const sign = sort.direction === "asc" ? 1 : -1;
  const indexed = rows.map((row, index) => ({ row, index }));
  indexed.sort((a, b) => {
    if (sort.key === "bed") return sign * (a.index - b.index);
    const va = value(a.row, sort.key);
    const vb = value(b.row, sort.key);
    if (va === null || vb === null) {
      if (va !== vb) return va === null ? 1 : -1;
      return a.index - b.index;
    }
    const c =
      typeof va === "number" && typeof vb === "number"
        ? va - vb
        : String(va).localeCompare(String(vb));
    return c !== 0 ? sign * c : a.index - b.index;
  });
  return indexed.map((i) => i.row);
}

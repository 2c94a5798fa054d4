import type { TimelineItem } from "./timeline";

/** One row of the timeline as shown: an item, or a run of identical readings. */
export type TimelineRow = {
  item: TimelineItem;
  /** How many readings the row stands for (1 for anything else). */
  count: number;
  /** The run's oldest time; equal to `item.at` for a single item. */
  firstAt: string;
};

/** Readings that say the same thing: same SpO2, device, FiO2, flow, source and person. */
function sameReading(a: TimelineItem, b: TimelineItem): boolean {
  if (a.kind !== "reading" || b.kind !== "reading") return false;
  const x = a.values;
  const y = b.values;
  return (
    x.spo2Pct === y.spo2Pct &&
    x.device === y.device &&
    x.fio2 === y.fio2 &&
    x.fio2Estimated === y.fio2Estimated &&
    x.flowLMin === y.flowLMin &&
    x.respiratoryRatePerMin === y.respiratoryRatePerMin &&
    x.source === y.source &&
    a.who === b.who
  );
}

/**
 * Collapses each run of consecutive identical readings (newest first, as the
 * timeline lists them) into one row that says how many and over what time, so
 * a steady monitor does not push every order and adjustment off the page. The
 * newest reading of a run represents it; anything between two readings ends
 * the run.
 */
export function collapseReadingRuns(items: readonly TimelineItem[]): TimelineRow[] {
  const rows: TimelineRow[] = [];
  for (const item of items) {
    const last = rows[rows.length - 1];
    if (last && sameReading(last.item, item)) {
      last.count += 1;
      last.firstAt = item.at;
    } else {
      rows.push({ item, count: 1, firstAt: item.at });
    }
  }
  return rows;
}

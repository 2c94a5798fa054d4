import { describe, expect, it } from "vitest";
import type { TimelineItem } from "@/lib/chart/timeline";
import { collapseReadingRuns } from "@/lib/chart/timeline-runs";

let id = 0;
const reading = (at: string, spo2: number, who: string | null = null): TimelineItem => ({
  cursor: `c${++id}`,
  kind: "reading",
  id,
  at,
  who,
  summary: `SpO2 ${spo2} %`,
  rationale: null,
  values: {
    spo2Pct: spo2,
    device: "hfnc",
    fio2: 0.4,
    flowLMin: 40,
    source: who ? "manual" : "monitor",
  },
});
const adjustment = (at: string): TimelineItem => ({
  cursor: `c${++id}`,
  kind: "adjustment",
  id,
  at,
  who: "Jonah Pell",
  summary: "FiO2 0.40 → 0.45",
  rationale: null,
  values: {},
});

describe("collapseReadingRuns", () => {
  it("folds consecutive identical readings into one row with their count and span", () => {
    const rows = collapseReadingRuns([
      reading("2026-12-03T10:03:00Z", 94),
      reading("2026-12-03T10:02:00Z", 94),
      reading("2026-12-03T10:01:00Z", 94),
      reading("2026-12-03T10:00:00Z", 93),
    ]);
    expect(rows.map((r) => [r.item.values.spo2Pct, r.count, r.item.at, r.firstAt])).toEqual([
      [94, 3, "2026-12-03T10:03:00Z", "2026-12-03T10:01:00Z"],
      [93, 1, "2026-12-03T10:00:00Z", "2026-12-03T10:00:00Z"],
    ]);
  });

  it("never folds across another entry, another person or another value", () => {
    const rows = collapseReadingRuns([
      reading("2026-12-03T10:05:00Z", 94),
      adjustment("2026-12-03T10:04:00Z"),
      reading("2026-12-03T10:03:00Z", 94),
      reading("2026-12-03T10:02:00Z", 94, "Hana Whitlock"),
      reading("2026-12-03T10:01:00Z", 95, "Hana Whitlock"),
    ]);
    expect(rows.map((r) => r.count)).toEqual([1, 1, 1, 1, 1]);
  });

  it("keeps every reading accounted for", () => {
    const items = Array.from({ length: 40 }, (_, i) =>
      reading(new Date(Date.UTC(2026, 11, 3, 10, 40 - i)).toISOString(), i < 25 ? 94 : 92),
    );
    const rows = collapseReadingRuns(items);
    expect(rows.reduce((n, r) => n + r.count, 0)).toBe(40);
    expect(rows.map((r) => r.count)).toEqual([25, 15]);
  });
});

import type { RouteEntry } from "./access-matrix";

// The reports: every role reads those of its own units; another unit answers
// 404. A week ending now, so each cell reads real rollups of the fixture.

const REPORTS = ["time-in-band", "alerts", "oxygen-exposure", "orders"] as const;

export const REPORT_ROUTES: Omit<RouteEntry, "via">[] = REPORTS.map((kind, i) => ({
  name: `GET /api/v1/reports/${kind}`,
  permission: "record.read",
  scope: "unit",
  ok: 200,
  call: (w, c) => {
    const to = new Date();
    const from = new Date(to.getTime() - 7 * 86_400_000);
    const groupBy = (["patient", "bed", "shift", "day"] as const)[i]!;
    const q = new URLSearchParams({
      unitId: String(w.unitId[c.unit]),
      from: from.toISOString(),
      to: to.toISOString(),
      groupBy,
    });
    return { path: `/api/v1/reports/${kind}?${q.toString()}` };
  },
}));

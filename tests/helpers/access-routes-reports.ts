import type { RouteEntry } from "./access-matrix";

// The reports: every role reads those of its own units; another unit answers
// 404. A week ending now, so each cell reads real rollups of the fixture.

const REPORTS = ["time-in-band", "alerts", "oxygen-exposure", "orders"] as const;

const GROUPED_REPORT_ROUTES: Omit<RouteEntry, "via">[] = REPORTS.map((kind, i) => ({
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

/** Forecast accuracy: the same period, no rows to choose. */
const FORECAST_ACCURACY_ROUTE: Omit<RouteEntry, "via"> = {
  name: "GET /api/v1/reports/forecast-accuracy",
  permission: "record.read",
  scope: "unit",
  ok: 200,
  call: (w, c) => {
    const to = new Date();
    const from = new Date(to.getTime() - 7 * 86_400_000);
    const q = new URLSearchParams({
      unitId: String(w.unitId[c.unit]),
      from: from.toISOString(),
      to: to.toISOString(),
    });
    return { path: `/api/v1/reports/forecast-accuracy?${q.toString()}` };
  },
};

export const REPORT_ROUTES = [...GROUPED_REPORT_ROUTES, FORECAST_ACCURACY_ROUTE];

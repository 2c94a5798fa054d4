import { describe, expect, it } from "vitest";
import type { Stay } from "@/lib/rollups/stays";
import {
  alertMeasures,
  alertRows,
  excursionToAdjustment,
  type AlertEvent,
} from "@/lib/reports/alerts";
import { makeGrouper, timeSlots } from "@/lib/reports/groups";
import { makeLocator, staySegments } from "@/lib/reports/stays";
import { distribution } from "@/lib/reports/stats";
import { at, names } from "./fixture";

const pattern = { timeZone: "UTC", shiftStart: "07:00", shiftHours: 12 } as const;
const from = at("07:00");
const to = at("07:00", 2);
// Patient 10 on unit 1 all day (24 h); patient 20 on unit 1 until 13:00, then unit 2.
const stays: Stay[] = [
  { admissionId: 1, patientId: 10, bedId: 100, unitId: 1, from: at("00:00"), to: Infinity },
  { admissionId: 2, patientId: 20, bedId: 101, unitId: 1, from: at("07:00"), to: at("13:00") },
  { admissionId: 2, patientId: 20, bedId: 900, unitId: 2, from: at("13:00"), to: Infinity },
];
const alert = (
  a: Partial<AlertEvent> & Pick<AlertEvent, "admissionId" | "openedAt">,
): AlertEvent => ({
  kind: "below_band",
  startedAt: a.openedAt,
  acknowledgedAt: null,
  resolvedAt: null,
  escalated: false,
  ...a,
});
const alerts: AlertEvent[] = [
  // Day shift. Started 08:00, opened 08:02, acknowledged 08:06, resolved 08:32; adjusted at 08:10.
  alert({
    admissionId: 1,
    startedAt: at("08:00"),
    openedAt: at("08:02"),
    acknowledgedAt: at("08:06"),
    resolvedAt: at("08:32"),
  }),
  // Day shift, escalated, acknowledged after 20 min, never resolved.
  alert({
    admissionId: 2,
    kind: "above_band",
    openedAt: at("10:00"),
    acknowledgedAt: at("10:20"),
    escalated: true,
  }),
  // Opened at 14:00 on unit 2: not this unit's.
  alert({ admissionId: 2, openedAt: at("14:00"), acknowledgedAt: at("14:01") }),
  // Night shift: overdue reassessment, acknowledged after 10 min, resolved after 40.
  alert({
    admissionId: 1,
    kind: "reassessment_overdue",
    openedAt: at("20:00"),
    acknowledgedAt: at("20:10"),
    resolvedAt: at("20:40"),
  }),
  // Night shift: an excursion resolved at 23:30 before the adjustment at 23:45.
  alert({ admissionId: 1, startedAt: at("23:00"), openedAt: at("23:01"), resolvedAt: at("23:30") }),
];
const adjustments = new Map([[1, [at("08:10"), at("23:45")]]]);

function report(groupBy: "shift" | "patient") {
  const slots = groupBy === "shift" ? timeSlots(pattern, "shift", from, to) : [];
  const segments = staySegments(stays, 1, from, to, slots);
  return alertRows({
    segments,
    alerts,
    adjustments,
    group: makeGrouper(groupBy, slots, names),
    locate: makeLocator(segments),
  });
}

describe("alert response", () => {
  it("measures only excursions, up to the first adjustment before the resolution", () => {
    expect(excursionToAdjustment(alerts[0]!, adjustments)).toBe(10);
    expect(excursionToAdjustment(alerts[3]!, adjustments)).toBeNull();
    expect(excursionToAdjustment(alerts[4]!, adjustments)).toBeNull();
  });

  it("sums the unit's alerts over the period", () => {
    const { summary } = report("patient");
    // Patient time: 24 h + 6 h = 30 h = 1.25 patient-days; 4 alerts on the unit.
    expect(alertMeasures(summary)).toEqual({
      alerts: 4,
      patientDays: 1.25,
      alertsPerPatientDay: 3.2,
      // 4, 20, 10 → median 10, p90 the ⌈2.7⌉ = 3rd: 20
      toAcknowledge: { n: 3, median: 10, p90: 20 },
      // 30, 40, 29 → median 30, p90 40
      toResolve: { n: 3, median: 30, p90: 40 },
      escalationRate: 0.25,
      excursionToAdjustment: { n: 1, median: 10, p90: 10 },
    });
  });

  it("groups by kind and by shift", () => {
    const { byKind, rows } = report("shift");
    expect(byKind.map((k) => [k.kind, k.acc.alerts])).toEqual([
      ["above_band", 1],
      ["below_band", 2],
      ["reassessment_overdue", 1],
    ]);
    expect(byKind[1]!.label).toBe("SpO2 below target");
    expect(rows.map((r) => [r.key.label, r.acc.alerts, r.acc.stayMs / 3_600_000])).toEqual([
      ["Shift from 2026-12-01 07:00", 2, 18],
      ["Shift from 2026-12-01 19:00", 2, 12],
    ]);
    expect(alertMeasures(rows[0]!.acc).toAcknowledge).toEqual({ n: 2, median: 12, p90: 20 });
  });
});

describe("percentiles", () => {
  it("follow simple-statistics' quantileSorted", () => {
    expect(distribution([])).toEqual({ n: 0, median: null, p90: null });
    expect(distribution([5])).toEqual({ n: 1, median: 5, p90: 5 });
    // 10 values: median the mean of the 5th and 6th; p90 the mean of the 9th and 10th.
    expect(distribution([10, 9, 8, 7, 6, 5, 4, 3, 2, 1])).toEqual({ n: 10, median: 5.5, p90: 9.5 });
  });
});

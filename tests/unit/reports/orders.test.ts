import { describe, expect, it } from "vitest";
import type { Stay } from "@/lib/rollups/stays";
import type { Proposal } from "@/lib/oxygen";
import { followsProposal } from "@/lib/adjustments/proposal";
import { makeGrouper, timeSlots } from "@/lib/reports/groups";
import {
  orderAt,
  orderMeasures,
  orderRows,
  reassessmentIntervals,
  type OrderSpan,
} from "@/lib/reports/orders";
import { makeLocator, staySegments } from "@/lib/reports/stays";
import { at, names } from "./fixture";

const span = (o: Partial<OrderSpan> & Pick<OrderSpan, "id" | "from" | "to">): OrderSpan => ({
  admissionId: 1,
  entryMode: "written",
  createdAt: o.from,
  cosignedAt: null,
  reassessMinutes: 60,
  pao2Upper: null,
  ...o,
});

describe("reassessments on time", () => {
  // Order 1 (every 60 min) from 07:00, superseded at 10:00 by order 2 (every 120 min).
  // Reassessments at 07:50, 09:00, 10:30, 14:00. "Now" is 17:00.
  //   order 1: 07:00→07:50 on time (50), 07:50→09:00 late (70); 09:00→10:00 order end: not due.
  //   order 2: 10:00→10:30 on time, 10:30→14:00 late (210); then 14:00 + 120 = 16:00 due, unclosed: late.
  const spans = [
    span({ id: 1, from: at("07:00"), to: at("10:00") }),
    span({ id: 2, from: at("10:00"), to: Infinity, reassessMinutes: 120 }),
  ];
  const times = new Map([[1, [at("07:50"), at("09:00"), at("10:30"), at("14:00")]]]);

  it("judges each interval against the order in effect", () => {
    expect(reassessmentIntervals(spans, times, at("17:00"))).toEqual([
      { admissionId: 1, at: at("07:50"), onTime: true },
      { admissionId: 1, at: at("09:00"), onTime: false },
      { admissionId: 1, at: at("10:30"), onTime: true },
      { admissionId: 1, at: at("14:00"), onTime: false },
      { admissionId: 1, at: at("16:00"), onTime: false },
    ]);
  });

  it("does not count an open interval that is not yet due", () => {
    expect(reassessmentIntervals(spans, times, at("15:00"))).toHaveLength(4);
  });

  it("finds the order in effect, the later one at the handover instant", () => {
    expect(orderAt(spans, 1, at("09:59"))?.id).toBe(1);
    expect(orderAt(spans, 1, at("10:00"))?.id).toBe(2);
    expect(orderAt(spans, 2, at("10:00"))).toBeNull();
  });
});

describe("the orders report's sums", () => {
  // Patient 10 on unit 1 07:00–19:00 (12 h = 0.5 patient-days), then unit 2.
  const stays: Stay[] = [
    { admissionId: 1, patientId: 10, bedId: 100, unitId: 1, from: at("07:00"), to: at("19:00") },
    { admissionId: 1, patientId: 10, bedId: 900, unitId: 2, from: at("19:00"), to: Infinity },
  ];
  const from = at("07:00");
  const to = at("07:00", 2);
  const orders = [
    span({ id: 1, from: at("07:00"), to: at("10:00") }),
    // Verbal at 10:00, co-signed at 10:45; telephone at 12:00, co-signed at 12:15;
    // verbal at 18:00 never co-signed; a telephone order at 20:00 is unit 2's.
    span({
      id: 2,
      from: at("10:00"),
      to: at("12:00"),
      entryMode: "verbal",
      cosignedAt: at("10:45"),
    }),
    span({
      id: 3,
      from: at("12:00"),
      to: at("18:00"),
      entryMode: "telephone",
      cosignedAt: at("12:15"),
    }),
    span({ id: 4, from: at("18:00"), to: at("20:00"), entryMode: "verbal" }),
    span({
      id: 5,
      from: at("20:00"),
      to: Infinity,
      entryMode: "telephone",
      cosignedAt: at("20:05"),
    }),
  ];
  const adjustments = [
    { admissionId: 1, at: at("08:00"), followedProposal: true },
    { admissionId: 1, at: at("09:00"), followedProposal: false },
    { admissionId: 1, at: at("11:00"), followedProposal: null },
    { admissionId: 1, at: at("20:30"), followedProposal: true },
  ];
  const intervals = [
    { admissionId: 1, at: at("08:00"), onTime: true },
    { admissionId: 1, at: at("09:00"), onTime: true },
    { admissionId: 1, at: at("12:30"), onTime: false },
    { admissionId: 1, at: at("21:00"), onTime: false },
  ];

  it("counts orders, co-sign delays, intervals and adjustments on the unit", () => {
    const slots = timeSlots(
      { timeZone: "UTC", shiftStart: "07:00", shiftHours: 12 },
      "shift",
      from,
      to,
    );
    const segments = staySegments(stays, 1, from, to, slots);
    const { summary, rows } = orderRows({
      segments,
      orders,
      intervals,
      adjustments,
      group: makeGrouper("shift", slots, names),
      locate: makeLocator(segments),
    });
    expect(orderMeasures(summary)).toEqual({
      orders: 4,
      verbalOrders: 3,
      cosignDelay: { n: 2, median: 30, p90: 45 },
      reassessments: 3,
      reassessmentsOnTime: 0.6667,
      adjustments: 3,
      adjustmentsPerPatientDay: 6,
      followedProposal: 0.5,
      patientDays: 0.5,
    });
    expect(rows.map((r) => [r.key.label, r.acc.orders])).toEqual([
      ["Shift from 2026-12-01 07:00", 4],
    ]);
  });
});

describe("whether an adjustment followed the proposal", () => {
  const proposal = (p: Partial<Proposal>): Proposal => ({
    direction: "up",
    urgent: false,
    step: { fio2: 0.4, peep: 8, stepIndex: 3 },
    stepsMoved: 1,
    stoppedBy: null,
    forecast: null,
    reason: "",
    caveats: [],
    ...p,
  });

  it("compares the applied settings with the step", () => {
    expect(followsProposal(proposal({}), "invasive", { fio2: 0.4, peep: 8, flow: null })).toBe(
      true,
    );
    expect(followsProposal(proposal({}), "invasive", { fio2: 0.45, peep: 8, flow: null })).toBe(
      false,
    );
    expect(followsProposal(proposal({}), "invasive", { fio2: 0.4, peep: 10, flow: null })).toBe(
      false,
    );
  });

  it("compares a low-flow device by its flow", () => {
    const p = proposal({ step: { fio2: 0.28, flow: 2, stepIndex: 1 } });
    expect(followsProposal(p, "nasal_cannula", { fio2: 0.29, peep: null, flow: 2 })).toBe(true);
    expect(followsProposal(p, "nasal_cannula", { fio2: 0.32, peep: null, flow: 3 })).toBe(false);
  });

  it("counts a change against a hold as not followed, and has no answer without a step", () => {
    expect(
      followsProposal(proposal({ direction: "hold", step: null }), "venturi_mask", {
        fio2: 0.35,
        peep: null,
        flow: null,
      }),
    ).toBe(false);
    expect(
      followsProposal(proposal({ direction: "escalate", step: null }), "venturi_mask", {
        fio2: 0.35,
        peep: null,
        flow: null,
      }),
    ).toBeNull();
    expect(
      followsProposal(null, "venturi_mask", { fio2: 0.35, peep: null, flow: null }),
    ).toBeNull();
  });
});

import type { GroupKey, OrderMeasures } from "./types";
import { Rows, type Where } from "./groups";
import type { StaySegment } from "./stays";
import { DAY_MINUTES, distribution, minutes, round, shareOf } from "./stats";

/**
 * Orders: verbal-order co-sign delay, reassessments on time, adjustments per
 * patient-day and the share that followed the engine's proposal. Pure.
 */

/** An order while it held: [from, to) in ms, `to` Infinity while it still holds. */
export type OrderSpan = {
  id: number;
  admissionId: number;
  from: number;
  to: number;
  entryMode: "written" | "verbal" | "telephone";
  /** Entered → co-signed, for verbal and telephone orders. */
  createdAt: number;
  cosignedAt: number | null;
  reassessMinutes: number;
  pao2Upper: number | null;
};

export type AdjustmentEvent = { admissionId: number; at: number; followedProposal: boolean | null };

/** The order of an admission in effect at `at` (the latest written, if two overlap). */
export function orderAt(
  spans: readonly OrderSpan[],
  admissionId: number,
  at: number,
): OrderSpan | null {
  let found: OrderSpan | null = null;
  for (const o of spans) {
    if (o.admissionId !== admissionId || o.from > at || at >= o.to) continue;
    if (!found || o.from >= found.from) found = o;
  }
  return found;
}

/** One judged interval between reassessments: where it is counted and whether it was on time. */
export type ReassessmentInterval = { admissionId: number; at: number; onTime: boolean };

/**
 * The intervals between reassessments (manual readings and adjustments,
 * times in ms) while each order held. An interval closed by a reassessment
 * is counted at that reassessment; one left open is counted late at the
 * time it fell due, if that is before the order ended and before `until`.
 */
export function reassessmentIntervals(
  spans: readonly OrderSpan[],
  reassessments: ReadonlyMap<number, readonly number[]>,
  until: number,
): ReassessmentInterval[] {
  const out: ReassessmentInterval[] = [];
  for (const o of spans) {
    const limit = o.reassessMinutes * 60_000;
    const end = Math.min(o.to, until);
    let last = o.from;
    for (const t of reassessments.get(o.admissionId) ?? []) {
      if (t <= o.from) continue;
      if (t >= end) break;
      out.push({ admissionId: o.admissionId, at: t, onTime: t - last <= limit });
      last = t;
    }
    if (last + limit < end)
      out.push({ admissionId: o.admissionId, at: last + limit, onTime: false });
  }
  return out;
}

type OrderAcc = {
  orders: number;
  verbal: number;
  cosign: number[];
  intervals: number;
  onTime: number;
  adjustments: number;
  withProposal: number;
  followed: number;
  stayMs: number;
};

const emptyOrderAcc = (): OrderAcc => ({
  orders: 0,
  verbal: 0,
  cosign: [],
  intervals: 0,
  onTime: 0,
  adjustments: 0,
  withProposal: 0,
  followed: 0,
  stayMs: 0,
});

export function orderMeasures(a: OrderAcc): OrderMeasures {
  const patientDays = minutes(a.stayMs) / DAY_MINUTES;
  return {
    orders: a.orders,
    verbalOrders: a.verbal,
    cosignDelay: distribution(a.cosign),
    reassessments: a.intervals,
    reassessmentsOnTime: shareOf(a.onTime, a.intervals),
    adjustments: a.adjustments,
    adjustmentsPerPatientDay: patientDays > 0 ? round(a.adjustments / patientDays) : null,
    followedProposal: shareOf(a.followed, a.withProposal),
    patientDays: round(patientDays, 4),
  };
}

/** Sums orders, reassessment intervals and adjustments into the summary and rows. */
export function orderRows(input: {
  segments: readonly StaySegment[];
  orders: readonly OrderSpan[];
  intervals: readonly ReassessmentInterval[];
  adjustments: readonly AdjustmentEvent[];
  group: (w: Where) => GroupKey | null;
  locate: (admissionId: number, at: number) => Where | null;
  always?: readonly GroupKey[];
}): { summary: OrderAcc; rows: { key: GroupKey; acc: OrderAcc }[] } {
  const summary = emptyOrderAcc();
  const rows = new Rows(emptyOrderAcc);
  for (const k of input.always ?? []) rows.ensure(k);
  const each = (admissionId: number, at: number, add: (a: OrderAcc) => void) => {
    const where = input.locate(admissionId, at);
    if (!where) return;
    add(summary);
    const key = input.group(where);
    if (key) add(rows.get(key));
  };
  for (const s of input.segments) {
    const key = input.group({ patientId: s.patientId, bedId: s.bedId, at: s.from });
    summary.stayMs += s.to - s.from;
    if (key) rows.get(key, true).stayMs += s.to - s.from;
  }
  for (const o of input.orders) {
    each(o.admissionId, o.createdAt, (a) => {
      a.orders += 1;
      if (o.entryMode === "written") return;
      a.verbal += 1;
      if (o.cosignedAt !== null) a.cosign.push(minutes(o.cosignedAt - o.createdAt));
    });
  }
  for (const i of input.intervals) {
    each(i.admissionId, i.at, (a) => {
      a.intervals += 1;
      if (i.onTime) a.onTime += 1;
    });
  }
  for (const j of input.adjustments) {
    each(j.admissionId, j.at, (a) => {
      a.adjustments += 1;
      if (j.followedProposal === null) return;
      a.withProposal += 1;
      if (j.followedProposal) a.followed += 1;
    });
  }
  return { summary, rows: rows.entries() };
}

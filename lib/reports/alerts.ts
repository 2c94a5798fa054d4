import { ALERT_KIND_LABELS, type AlertKind } from "../alerts/kinds";
import type { AlertMeasures, GroupKey } from "./types";
import { Rows, type Where } from "./groups";
import type { StaySegment } from "./stays";
import { DAY_MINUTES, distribution, minutes, round, shareOf } from "./stats";

/**
 * Alert response: opened → acknowledged and → resolved, escalation rate,
 * alerts per patient-day, and excursion start → first adjustment. Pure.
 */

export type AlertEvent = {
  admissionId: number;
  kind: AlertKind;
  startedAt: number;
  openedAt: number;
  acknowledgedAt: number | null;
  resolvedAt: number | null;
  escalated: boolean;
};

const EXCURSIONS: readonly AlertKind[] = ["below_band", "above_band"];

/**
 * Minutes from an excursion's start to the admission's first adjustment at or
 * after it and no later than the alert's resolution; null when there was none.
 * `adjustments` holds each admission's applied_at times, sorted.
 */
export function excursionToAdjustment(
  alert: AlertEvent,
  adjustments: ReadonlyMap<number, readonly number[]>,
): number | null {
  if (!EXCURSIONS.includes(alert.kind)) return null;
  const first = (adjustments.get(alert.admissionId) ?? []).find((t) => t >= alert.startedAt);
  if (first === undefined) return null;
  if (alert.resolvedAt !== null && first > alert.resolvedAt) return null;
  return minutes(first - alert.startedAt);
}

type AlertAcc = {
  alerts: number;
  escalated: number;
  ack: number[];
  resolve: number[];
  toAdjust: number[];
  stayMs: number;
};

const emptyAlertAcc = (): AlertAcc => ({
  alerts: 0,
  escalated: 0,
  ack: [],
  resolve: [],
  toAdjust: [],
  stayMs: 0,
});

export function alertMeasures(a: AlertAcc, stayMs = a.stayMs): AlertMeasures {
  const patientDays = minutes(stayMs) / DAY_MINUTES;
  return {
    alerts: a.alerts,
    patientDays: round(patientDays, 4),
    alertsPerPatientDay: patientDays > 0 ? round(a.alerts / patientDays) : null,
    toAcknowledge: distribution(a.ack),
    toResolve: distribution(a.resolve),
    escalationRate: shareOf(a.escalated, a.alerts),
    excursionToAdjustment: distribution(a.toAdjust),
  };
}

/** Sums alerts into the summary, per kind and per row (by when each alert opened). */
export function alertRows(input: {
  segments: readonly StaySegment[];
  alerts: readonly AlertEvent[];
  adjustments: ReadonlyMap<number, readonly number[]>;
  group: (w: Where) => GroupKey | null;
  locate: (admissionId: number, at: number) => Where | null;
  always?: readonly GroupKey[];
}) {
  const summary = emptyAlertAcc();
  const rows = new Rows(emptyAlertAcc);
  const kinds = new Map<AlertKind, AlertAcc>();
  for (const k of input.always ?? []) rows.ensure(k);
  for (const s of input.segments) {
    const key = input.group({ patientId: s.patientId, bedId: s.bedId, at: s.from });
    summary.stayMs += s.to - s.from;
    if (key) rows.get(key, true).stayMs += s.to - s.from;
  }
  for (const alert of input.alerts) {
    const where = input.locate(alert.admissionId, alert.openedAt);
    if (!where) continue;
    const key = input.group(where);
    let kind = kinds.get(alert.kind);
    if (!kind) kinds.set(alert.kind, (kind = emptyAlertAcc()));
    const toAdjust = excursionToAdjustment(alert, input.adjustments);
    for (const a of key ? [summary, kind, rows.get(key)] : [summary, kind]) {
      a.alerts += 1;
      if (alert.escalated) a.escalated += 1;
      if (alert.acknowledgedAt !== null) a.ack.push(minutes(alert.acknowledgedAt - alert.openedAt));
      if (alert.resolvedAt !== null) a.resolve.push(minutes(alert.resolvedAt - alert.openedAt));
      if (toAdjust !== null) a.toAdjust.push(toAdjust);
    }
  }
  const byKind = [...kinds.entries()]
    .sort(([a], [b]) => a.localeCompare(b))
    .map(([kind, acc]) => ({ kind, label: ALERT_KIND_LABELS[kind], acc }));
  return { summary, byKind, rows: rows.entries() };
}

import type { Knex } from "knex";
import { alertMeasures, alertRows } from "./alerts";
import { basisOf } from "./basis";
import { exposureMeasures } from "./exposure";
import { makeGrouper, timeSlots, type TimeSlot } from "./groups";
import { loadRollupSums } from "./rollups";
import {
  loadAdjustments,
  loadAlerts,
  loadArterialGases,
  loadManualReadingTimes,
  loadNames,
  loadOrderSpans,
  loadUnit,
  loadUnitStays,
  timesByAdmission,
} from "./load";
import { orderAt, orderMeasures, orderRows, reassessmentIntervals } from "./orders";
import { makeLocator, staySegments } from "./stays";
import { timeInBandRows, timeMeasures } from "./time-in-band";
import type {
  AlertsReport,
  GroupKey,
  OrdersReport,
  OxygenExposureReport,
  ReportKind,
  ReportOf,
  ReportParams,
  TimeInBandReport,
} from "./types";

/**
 * What every report starts from: the unit, its stays in the period, the rows.
 * Time after `now` is not counted (nobody lay there yet); its rows still show.
 */
async function context(knex: Knex, requested: ReportParams, now: Date) {
  const from = requested.from.getTime();
  const to = Math.max(from, Math.min(requested.to.getTime(), now.getTime()));
  const params = { ...requested, to: new Date(to) };
  const [unit, stays] = await Promise.all([
    loadUnit(knex, params.unitId),
    loadUnitStays(knex, params.unitId, params.from, params.to),
  ]);
  const slots: TimeSlot[] =
    params.groupBy === "shift" || params.groupBy === "day"
      ? timeSlots(unit.pattern, params.groupBy, from, requested.to.getTime())
      : [];
  const names = await loadNames(knex, unit.id, stays);
  const segments = staySegments(stays, unit.id, from, to, slots);
  const always: GroupKey[] = slots.map((s) => ({
    key: s.key,
    label: s.label,
    startsAt: s.startsAt,
  }));
  return {
    params,
    admissionIds: [...new Set(stays.map((s) => s.admissionId))],
    from,
    to,
    unit,
    slots,
    stays,
    segments,
    always,
    group: makeGrouper(params.groupBy, slots, names),
    locate: makeLocator(segments),
    period: {
      unitId: unit.id,
      unitCode: unit.code,
      unitName: unit.name,
      timeZone: unit.pattern.timeZone,
      from: params.from.toISOString(),
      to: requested.to.toISOString(),
      groupBy: params.groupBy,
      generatedAt: now.toISOString(),
    },
  };
}

type Context = Awaited<ReturnType<typeof context>>;

async function timeInBand(knex: Knex, params: ReportParams, c: Context): Promise<TimeInBandReport> {
  const [pieces, gases, spans] = await Promise.all([
    loadRollupSums(knex, {
      unitId: c.unit.id,
      admissionIds: c.admissionIds,
      from: params.from,
      to: params.to,
      slots: c.slots,
    }),
    loadArterialGases(knex, c.stays, params.from, params.to),
    loadOrderSpans(knex, c.stays, params.to),
  ]);
  const { summary, rows } = timeInBandRows({
    ...c,
    pieces,
    gases: gases.map((g) => ({
      ...g,
      pao2Upper: orderAt(spans, g.admissionId, g.at)?.pao2Upper ?? null,
    })),
  });
  return {
    period: c.period,
    summary: timeMeasures(summary),
    rows: rows.map((r) => ({ ...r.key, ...timeMeasures(r.acc) })),
    basis: basisOf([
      "patientMinutes",
      "inBand",
      "below",
      "above",
      "unknown",
      "below88",
      "below85",
      "belowArea",
      "minSpo2",
      "gasesAbovePao2",
    ]),
  };
}

async function exposure(
  knex: Knex,
  params: ReportParams,
  c: Context,
): Promise<OxygenExposureReport> {
  const pieces = await loadRollupSums(knex, {
    unitId: c.unit.id,
    admissionIds: c.admissionIds,
    from: params.from,
    to: params.to,
    slots: c.slots,
  });
  const { summary, rows } = timeInBandRows({ ...c, pieces, gases: [] });
  return {
    period: c.period,
    summary: exposureMeasures(summary),
    rows: rows.map((r) => ({ ...r.key, ...exposureMeasures(r.acc) })),
    basis: basisOf(["patientDays", "oxygenHours", "fio2Hours", "highFio2Hours", "aboveOnOxygen"]),
  };
}

async function alerts(knex: Knex, params: ReportParams, c: Context): Promise<AlertsReport> {
  const list = await loadAlerts(knex, c.stays, params.from, params.to);
  const earliest = Math.min(c.from, ...list.map((a) => a.startedAt));
  const adjustments = await loadAdjustments(knex, c.stays, new Date(earliest), params.to);
  const { summary, byKind, rows } = alertRows({
    ...c,
    alerts: list,
    adjustments: timesByAdmission(adjustments),
  });
  return {
    period: c.period,
    summary: alertMeasures(summary),
    // Per kind, the denominator is the unit's patient time.
    byKind: byKind.map((k) => ({
      kind: k.kind,
      label: k.label,
      ...alertMeasures(k.acc, summary.stayMs),
    })),
    rows: rows.map((r) => ({ ...r.key, ...alertMeasures(r.acc) })),
    basis: basisOf([
      "alerts",
      "patientDays",
      "alertsPerPatientDay",
      "toAcknowledge",
      "toResolve",
      "escalationRate",
      "excursionToAdjustment",
    ]),
  };
}

async function orders(
  knex: Knex,
  params: ReportParams,
  c: Context,
  now: Date,
): Promise<OrdersReport> {
  const spans = await loadOrderSpans(knex, c.stays, params.to);
  // The reassessments that open the intervals ending in the period may lie
  // before it: read from the start of the earliest order that held in it.
  const held = spans.filter((o) => o.to > c.from);
  const earliest = new Date(Math.min(c.from, ...held.map((o) => o.from)));
  const [adjustments, manual] = await Promise.all([
    loadAdjustments(knex, c.stays, earliest, params.to),
    loadManualReadingTimes(knex, c.stays, earliest, params.to),
  ]);
  const intervals = reassessmentIntervals(
    held,
    timesByAdmission([...adjustments, ...manual]),
    Math.min(c.to, now.getTime()),
  );
  const { summary, rows } = orderRows({
    ...c,
    orders: spans.filter((o) => o.createdAt >= c.from),
    intervals,
    adjustments: adjustments.filter((a) => a.at >= c.from),
  });
  return {
    period: c.period,
    summary: orderMeasures(summary),
    rows: rows.map((r) => ({ ...r.key, ...orderMeasures(r.acc) })),
    basis: basisOf([
      "orders",
      "cosignDelay",
      "reassessments",
      "patientDays",
      "adjustmentsPerPatientDay",
      "followedProposal",
    ]),
  };
}

/** Builds one report for one unit and period (the caller has checked the unit). */
export async function loadReport<K extends ReportKind>(
  knex: Knex,
  kind: K,
  params: ReportParams,
  now: Date = new Date(),
): Promise<ReportOf<K>> {
  const c = await context(knex, params, now);
  const build: Record<ReportKind, () => Promise<ReportOf<ReportKind>>> = {
    "time-in-band": () => timeInBand(knex, c.params, c),
    alerts: () => alerts(knex, c.params, c),
    "oxygen-exposure": () => exposure(knex, c.params, c),
    orders: () => orders(knex, c.params, c, now),
  };
  return (await build[kind]()) as ReportOf<K>;
}

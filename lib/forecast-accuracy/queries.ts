import type { Knex } from "knex";
import type { Actor } from "../auth/actor";
import { findReadableAdmission } from "../admissions/access";
import { loadNames, loadUnit } from "../reports/load";
import { loadStays } from "../rollups/stays";
import { forecastAccuracyBasis } from "./basis";
import { MIN_PAIRS_FOR_INTERVAL, EMPIRICAL_INTERVAL_RULE } from "./interval";
import { loadAdmissionEvents, pairingSettings } from "./load";
import { pairForecasts } from "./pairing";
import { UNCHECKED_REASONS } from "./reasons";
import {
  calibrationPoints,
  summarizeByDevice,
  summarizeByFio2Step,
  summarizePairs,
} from "./summary";
import type { ForecastPair, UncheckedAdjustment } from "./types";
import {
  pairView,
  uncheckedView,
  type ForecastAccuracyReport,
  type ForecastPairView,
  type PatientForecastAccuracy,
} from "./views";

/**
 * How the forecasts did for one patient: every change of the current (or,
 * discharged, the last) admission paired or left unchecked with its reason.
 * Another unit's patient answers 404, as the Chart does.
 */
export async function loadPatientForecastAccuracy(
  knex: Knex,
  actor: Actor,
  patientId: number,
): Promise<PatientForecastAccuracy> {
  const admission = await findReadableAdmission(knex, actor, patientId);
  return loadAdmissionForecastAccuracy(knex, patientId, admission.admissionId);
}

/** The same for an admission the caller has already checked (the Chart has). */
export async function loadAdmissionForecastAccuracy(
  knex: Knex,
  patientId: number,
  admissionId: number,
): Promise<PatientForecastAccuracy> {
  const settings = pairingSettings();
  const events = (await loadAdmissionEvents(knex, [admissionId])).get(admissionId)!;
  const { pairs, unchecked } = pairForecasts(events, settings);
  const newestFirst = <T extends { appliedAt: Date }>(xs: T[]) =>
    [...xs].sort((a, b) => b.appliedAt.getTime() - a.appliedAt.getTime());
  return {
    patientId,
    admissionId,
    settings,
    pairs: newestFirst(pairs).map(pairView),
    unchecked: newestFirst(unchecked).map(uncheckedView),
    summary: summarizePairs(pairs),
    interval: {
      pairs: pairs.length,
      minPairs: MIN_PAIRS_FOR_INTERVAL,
      active: pairs.length >= MIN_PAIRS_FOR_INTERVAL,
      rule: EMPIRICAL_INTERVAL_RULE,
    },
    basis: forecastAccuracyBasis(settings),
  };
}

/**
 * The unit's forecasts: changes recorded in [from, to) while the admission
 * lay on the unit, each checked against the gas that followed (which may come
 * after `to`). Unit access is the caller's check.
 */
export async function loadForecastAccuracyReport(
  knex: Knex,
  query: { unitId: number; from: Date; to: Date },
  now: Date = new Date(),
): Promise<ForecastAccuracyReport> {
  const { unitId, from } = query;
  const to = new Date(Math.min(query.to.getTime(), now.getTime()));
  const settings = pairingSettings();
  const unit = await loadUnit(knex, unitId);
  const stays = await loadStays(knex, { unitIds: [unitId], from, to });
  const admissionIds = [...new Set(stays.map((s) => s.admissionId))];
  const [events, names] = await Promise.all([
    loadAdmissionEvents(knex, admissionIds, { from, to }),
    loadNames(knex, unitId, stays),
  ]);
  // A change counts for the unit if its admission lay on the unit when it was applied.
  const stayAt = (admissionId: number, at: Date) =>
    stays.find(
      (s) => s.admissionId === admissionId && s.from <= at.getTime() && at.getTime() < s.to,
    );
  const pairs: (ForecastPair & { stay: (typeof stays)[number] })[] = [];
  const unchecked: (UncheckedAdjustment & { stay: (typeof stays)[number] })[] = [];
  for (const [admissionId, e] of events) {
    const result = pairForecasts(e, settings);
    for (const p of result.pairs) {
      const stay = stayAt(admissionId, p.appliedAt);
      if (stay) pairs.push({ ...p, stay });
    }
    for (const u of result.unchecked) {
      const stay = stayAt(admissionId, u.appliedAt);
      if (stay) unchecked.push({ ...u, stay });
    }
  }
  const byTime = (a: { appliedAt: Date }, b: { appliedAt: Date }) =>
    a.appliedAt.getTime() - b.appliedAt.getTime();
  pairs.sort(byTime);
  unchecked.sort(byTime);
  const where = (stay: (typeof stays)[number]) => ({
    patientId: stay.patientId,
    patient: names.patients.get(stay.patientId) ?? `Patient ${stay.patientId}`,
    bed: names.beds.get(stay.bedId) ?? "—",
  });
  const plain = pairs.map(({ stay: _stay, ...p }) => p);
  return {
    unit: { id: unit.id, code: unit.code, name: unit.name },
    period: { from: from.toISOString(), to: to.toISOString() },
    generatedAt: now.toISOString(),
    settings,
    counts: {
      changes: pairs.length + unchecked.length,
      checked: pairs.length,
      unchecked: unchecked.length,
      byReason: Object.entries(UNCHECKED_REASONS)
        .map(([reason, r]) => ({
          reason: reason as UncheckedAdjustment["reason"],
          label: r.label,
          count: unchecked.filter((u) => u.reason === reason).length,
        }))
        .filter((r) => r.count > 0),
    },
    summary: summarizePairs(plain),
    byDevice: summarizeByDevice(plain),
    byFio2Step: summarizeByFio2Step(plain),
    calibration: calibrationPoints(plain),
    pairs: pairs.map(({ stay, ...p }) => ({ ...pairView(p), ...where(stay) })),
    unchecked: unchecked.map(({ stay, ...u }) => ({ ...uncheckedView(u), ...where(stay) })),
    basis: forecastAccuracyBasis(settings),
  };
}

/**
 * One admission's checked forecasts, oldest first: what the adjustment form
 * widens a new forecast's range with (forecastInterval). One read of the
 * admission's events and the pure pairing; unit access is the caller's check.
 */
export async function loadAdmissionForecastPairs(
  knex: Knex,
  admissionId: number,
): Promise<ForecastPairView[]> {
  const events = (await loadAdmissionEvents(knex, [admissionId])).get(admissionId)!;
  return pairForecasts(events, pairingSettings()).pairs.map(pairView);
}

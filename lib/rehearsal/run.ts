import { CARE_MODELS, runStay, type CareModel, type StayResult } from "./care";
import { DEFAULT_PARAMETERS, type RehearsalParameters } from "./parameters";
import { drawPatient } from "./patient";

/** The default cohort: 100 patients over 72 h. */
export const DEFAULT_COHORT = { patients: 100, hours: 72 } as const;

/**
 * Median time in the target range under manual oxygen titration, 71 % (BMJ Open
 * Respir Res 2021;8:e000843): the fixed-interval routine is calibrated to it.
 */
export const PUBLISHED_MANUAL_MEDIAN_IN_RANGE = 0.71;

export type RehearsalInput = {
  seed: number;
  patients: number;
  /** Length of every stay. */
  hours: number;
  parameters?: RehearsalParameters;
  models?: readonly CareModel[];
  /** Called after each patient (every care model), with patients done and asked for. */
  onProgress?: (done: number, total: number) => void;
};

/** One care model over the cohort. Shares are fractions of the period (0–1). */
export type ModelSummary = {
  model: CareModel;
  /** The median over patients of each patient's share of time in band. */
  medianInBand: number;
  /** Pooled over the cohort's time. */
  inBand: number;
  below: number;
  above: number;
  unknown: number;
  /** Hours per patient-day with SpO2 under 88 % and under 85 %. */
  below88HoursPerDay: number;
  below85HoursPerDay: number;
  /** FiO2-hours above room air per patient-day. */
  fio2HoursPerDay: number;
  adjustmentsPerDay: number;
  alertsPerDay: number;
  escalationsPerDay: number;
};

export type RehearsalResult = {
  input: { seed: number; patients: number; hours: number };
  parameters: RehearsalParameters;
  stays: StayResult[];
  models: ModelSummary[];
};

function median(values: number[]): number {
  const sorted = [...values].sort((a, b) => a - b);
  const n = sorted.length;
  if (n === 0) return 0;
  const mid = Math.floor(n / 2);
  return n % 2 ? sorted[mid]! : (sorted[mid - 1]! + sorted[mid]!) / 2;
}

export function summarise(model: CareModel, stays: readonly StayResult[]): ModelSummary {
  const own = stays.filter((s) => s.model === model);
  const sum = (pick: (s: StayResult) => number) => own.reduce((a, s) => a + pick(s), 0);
  const period = sum((s) => s.periodMs);
  const days = period / 86_400_000;
  const share = (ms: number) => (period > 0 ? ms / period : 0);
  const perDay = (x: number) => (days > 0 ? x / days : 0);
  return {
    model,
    medianInBand: median(own.map((s) => (s.periodMs > 0 ? s.inBandMs / s.periodMs : 0))),
    inBand: share(sum((s) => s.inBandMs)),
    below: share(sum((s) => s.belowMs)),
    above: share(sum((s) => s.aboveMs)),
    unknown: share(sum((s) => s.unknownMs)),
    below88HoursPerDay: perDay(sum((s) => s.below88Ms) / 3_600_000),
    below85HoursPerDay: perDay(sum((s) => s.below85Ms) / 3_600_000),
    fio2HoursPerDay: perDay(sum((s) => s.fio2HoursAboveRoomAir)),
    adjustmentsPerDay: perDay(sum((s) => s.adjustments)),
    alertsPerDay: perDay(sum((s) => s.alerts)),
    escalationsPerDay: perDay(sum((s) => s.escalations)),
  };
}

/**
 * Runs the cohort through each care model: the same patients, the same
 * courses (seeded), one stay at a time, so memory stays flat however long.
 */
export function runRehearsal(input: RehearsalInput): RehearsalResult {
  const parameters = input.parameters ?? DEFAULT_PARAMETERS;
  const models = input.models ?? CARE_MODELS;
  const stays: StayResult[] = [];
  for (let i = 0; i < input.patients; i++) {
    const profile = drawPatient(input.seed, i, parameters);
    for (const model of models)
      stays.push(runStay(profile, model, input.seed, input.hours, parameters));
    input.onProgress?.(i + 1, input.patients);
  }
  return {
    input: { seed: input.seed, patients: input.patients, hours: input.hours },
    parameters,
    stays,
    models: models.map((model) => summarise(model, stays)),
  };
}

import { mean, median } from "simple-statistics";
import {
  FORECAST_MODEL_LABELS,
  FORECAST_MODELS,
  type ForecastModel,
  type ForecastPair,
} from "./types";

/**
 * How close each model came over a set of pairs (one patient, a unit, a
 * device, a band of FiO2 steps). Pure; unrounded (the screens round). Medians
 * by simple-statistics' median: the middle value, or the mean of the middle
 * two for an even count.
 */

export type ModelSummary = {
  model: ForecastModel;
  label: string;
  n: number;
  /** median of |predicted − measured|, mmHg */
  medianAbsoluteError: number | null;
  /** median of predicted − measured, mmHg: positive when the model forecasts too high */
  bias: number | null;
  /** mean of predicted − measured, mmHg */
  meanError: number | null;
};

/** The shown range (the three models' spread) against the measured PaO2. */
export type RangeCoverage = {
  n: number;
  inRange: number;
  /** measured below the range's low end */
  below: number;
  /** measured above the range's high end */
  above: number;
  /** inRange / n; null without pairs */
  share: number | null;
};

export type AccuracySummary = {
  n: number;
  models: Record<ForecastModel, ModelSummary>;
  coverage: RangeCoverage;
  /** the model(s) with the lowest median absolute error, all of them at a tie; null without pairs */
  closest: { models: ForecastModel[]; medianAbsoluteError: number } | null;
};

/** Medians closer than this (mmHg) are a tie. */
const TIE_MMHG = 1e-9;

export function summarizePairs(pairs: readonly ForecastPair[]): AccuracySummary {
  const models = Object.fromEntries(
    FORECAST_MODELS.map((model) => [model, modelSummary(pairs, model)]),
  ) as Record<ForecastModel, ModelSummary>;
  const inRange = pairs.filter((p) => p.inRange).length;
  const below = pairs.filter((p) => p.measured < p.range.low).length;
  return {
    n: pairs.length,
    models,
    coverage: {
      n: pairs.length,
      inRange,
      below,
      above: pairs.length - inRange - below,
      share: pairs.length > 0 ? inRange / pairs.length : null,
    },
    closest: closestModels(models),
  };
}

function modelSummary(pairs: readonly ForecastPair[], model: ForecastModel): ModelSummary {
  const errors = pairs.map((p) => p.models[model].error);
  const empty = errors.length === 0;
  return {
    model,
    label: FORECAST_MODEL_LABELS[model],
    n: errors.length,
    medianAbsoluteError: empty ? null : median(errors.map(Math.abs)),
    bias: empty ? null : median(errors),
    meanError: empty ? null : mean(errors),
  };
}

function closestModels(models: Record<ForecastModel, ModelSummary>): AccuracySummary["closest"] {
  let best: number | null = null;
  for (const m of FORECAST_MODELS) {
    const mae = models[m].medianAbsoluteError;
    if (mae !== null && (best === null || mae < best)) best = mae;
  }
  if (best === null) return null;
  const lowest = best;
  return {
    models: FORECAST_MODELS.filter((m) => {
      const mae = models[m].medianAbsoluteError;
      return mae !== null && mae - lowest <= TIE_MMHG;
    }),
    medianAbsoluteError: lowest,
  };
}

/** Groups pairs by a key and summarises each group; groups in `order` first (kept when empty), then the rest sorted. */
export function summarizeGroups<K extends string>(
  pairs: readonly ForecastPair[],
  keyOf: (pair: ForecastPair) => K,
  order: readonly K[] = [],
): { key: K; summary: AccuracySummary }[] {
  const groups = new Map<K, ForecastPair[]>(order.map((k) => [k, []]));
  for (const pair of pairs) {
    const key = keyOf(pair);
    const group = groups.get(key);
    if (group) group.push(pair);
    else groups.set(key, [pair]);
  }
  const rest = [...groups.keys()].filter((k) => !order.includes(k)).sort();
  return [...order, ...rest].map((key) => ({
    key,
    summary: summarizePairs(groups.get(key) ?? []),
  }));
}

/** One summary per device, in device order. */
export function summarizeByDevice(
  pairs: readonly ForecastPair[],
): { device: string; summary: AccuracySummary }[] {
  return summarizeGroups(pairs, (p) => p.device).map(({ key, summary }) => ({
    device: key,
    summary,
  }));
}

/**
 * Bands of the size of the FiO2 step (|toFio2 − fromFio2|), upper bound
 * inclusive. 0.05 is the finest step a titration usually takes; the ARDS
 * Network tables step FiO2 by 0.1, so 0.05–0.15 holds one table row and more
 * than 0.15 holds several — where a constant-P/F forecast drifts most, since
 * P/F itself changes with FiO2 (Karbing et al. 2007).
 */
export const FIO2_STEP_BANDS = [
  { key: "small", label: "FiO2 step up to 0.05", upTo: 0.05 },
  { key: "medium", label: "FiO2 step over 0.05, up to 0.15", upTo: 0.15 },
  { key: "large", label: "FiO2 step over 0.15", upTo: Infinity },
] as const;
export type Fio2StepBand = (typeof FIO2_STEP_BANDS)[number]["key"];

export function fio2StepBand(step: number): Fio2StepBand {
  const size = Math.abs(step);
  return (FIO2_STEP_BANDS.find((b) => size <= b.upTo) ?? FIO2_STEP_BANDS[2]).key;
}

/** One summary per FiO2 step band, all three bands, small to large (empty ones with n = 0). */
export function summarizeByFio2Step(
  pairs: readonly ForecastPair[],
): { band: Fio2StepBand; label: string; summary: AccuracySummary }[] {
  const order = FIO2_STEP_BANDS.map((b) => b.key);
  return summarizeGroups(pairs, (p) => fio2StepBand(p.fio2Step), order).map(({ key, summary }) => ({
    band: key,
    label: FIO2_STEP_BANDS.find((b) => b.key === key)?.label ?? key,
    summary,
  }));
}

export type CalibrationPoint = {
  model: ForecastModel;
  adjustmentId: number;
  gasId: number;
  /** mmHg */
  predicted: number;
  /** mmHg */
  measured: number;
};

/** Predicted against measured PaO2, one point per pair and model, grouped by model in the screens' order. */
export function calibrationPoints(pairs: readonly ForecastPair[]): CalibrationPoint[] {
  return FORECAST_MODELS.flatMap((model) =>
    pairs.map((p) => ({
      model,
      adjustmentId: p.adjustmentId,
      gasId: p.gasId,
      predicted: p.models[model].predicted,
      measured: p.measured,
    })),
  );
}

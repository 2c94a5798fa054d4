import { severinghausSaturation } from "../oxygen/dissociation";
import type { Fio2Forecast } from "../oxygen/forecast";
import { FORECAST_MODELS, type ForecastModel, type ForecastPair } from "./types";

/** Pairs a patient needs before the shown range is widened to their own errors. */
export const MIN_PAIRS_FOR_INTERVAL = 3;

// One template literal, not a concatenation: Next's production minifier
// (SWC) drops the tail of the first template when it folds template + … +
// template with constants inlined, which cut this text to its first and last
// words in the server build.
export const EMPIRICAL_INTERVAL_RULE = `Once the patient has at least ${MIN_PAIRS_FOR_INTERVAL} checked forecasts (pairs), each model's new PaO2 forecast P is widened by that model's own errors (e = predicted − measured) in those pairs: from P − (largest error) to P − (smallest error), the measured values the patient's past errors would have given. The interval shown is the union of the three models' intervals and the models' spread (so it is never narrower than the usual range), with its low end no lower than 0 mmHg; SpO2 at each end from the Severinghaus curve. If the next error behaves like the patient's past ones (exchangeable), it lies between the smallest and largest of n past errors with probability (n − 1)/(n + 1): 50 % with 3 pairs, 80 % with 9, 90 % with 19 (order statistics). With fewer than ${MIN_PAIRS_FOR_INTERVAL} pairs the range stays the spread of the three models.`;

export type IntervalEnd = { pao2: number; spo2: number };

export type ModelInterval = {
  model: ForecastModel;
  /** this forecast's PaO2 by the model, mmHg */
  predicted: number;
  /** the smallest and largest of the patient's errors (predicted − measured) for the model, mmHg */
  minError: number;
  maxError: number;
  /** predicted − maxError … predicted − minError, mmHg */
  low: number;
  high: number;
};

type Common = {
  /** pairs the rule used */
  n: number;
  low: IntervalEnd;
  high: IntervalEnd;
  /** the forecast's own range: the spread of the three models, mmHg */
  shown: { low: number; high: number };
  label: string;
  basis: string;
};

export type ForecastInterval =
  | (Common & {
      kind: "empirical";
      models: Record<ForecastModel, ModelInterval>;
      /** (n − 1)/(n + 1): how often the next error falls within n past extremes, for exchangeable errors */
      nominalCoverage: number;
    })
  | (Common & { kind: "shown"; reason: string });

const end = (pao2: number): IntervalEnd => ({ pao2, spo2: 100 * severinghausSaturation(pao2) });

/**
 * The range to show with a new forecast: the patient's empirical interval once
 * they have MIN_PAIRS_FOR_INTERVAL pairs, otherwise the forecast's own range
 * with the reason. `asOf` keeps only pairs whose gas was sampled by then (what
 * was known when the forecast was made).
 */
export function forecastInterval(
  forecast: Fio2Forecast,
  patientPairs: readonly ForecastPair[],
  options: { asOf?: Date } = {},
): ForecastInterval {
  const { asOf } = options;
  const pairs =
    asOf === undefined
      ? patientPairs
      : patientPairs.filter((p) => p.sampledAt.getTime() <= asOf.getTime());
  const n = pairs.length;
  const shown = { low: forecast.range.low.pao2, high: forecast.range.high.pao2 };
  if (n < MIN_PAIRS_FOR_INTERVAL) {
    return {
      kind: "shown",
      n,
      low: { ...forecast.range.low },
      high: { ...forecast.range.high },
      shown,
      label: "forecast range (spread of the three models)",
      basis: EMPIRICAL_INTERVAL_RULE,
      reason: `${n === 0 ? "No" : n} checked forecast${n === 1 ? "" : "s"} for this patient so far; the empirical interval needs at least ${MIN_PAIRS_FOR_INTERVAL}, so the range stays the spread of the three models.`,
    };
  }
  const models = Object.fromEntries(
    FORECAST_MODELS.map((model) => {
      const predicted = forecast.models[model].pao2;
      const errors = pairs.map((p) => p.models[model].error);
      const minError = Math.min(...errors);
      const maxError = Math.max(...errors);
      const interval: ModelInterval = {
        model,
        predicted,
        minError,
        maxError,
        low: predicted - maxError,
        high: predicted - minError,
      };
      return [model, interval];
    }),
  ) as Record<ForecastModel, ModelInterval>;
  const each = FORECAST_MODELS.map((m) => models[m]);
  const low = Math.max(0, Math.min(shown.low, ...each.map((m) => m.low)));
  const high = Math.max(shown.high, ...each.map((m) => m.high));
  return {
    kind: "empirical",
    n,
    low: end(low),
    high: end(high),
    shown,
    models,
    nominalCoverage: (n - 1) / (n + 1),
    label: `empirical interval (${n} pairs)`,
    basis: EMPIRICAL_INTERVAL_RULE,
  };
}

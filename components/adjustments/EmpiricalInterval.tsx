"use client";

import { useMemo } from "react";
import { BasisDisclosure } from "@/components/oxygenation/BasisDisclosure";
import { formatNumber, formatPressureNumber } from "@/components/oxygenation/format";
import {
  EMPIRICAL_INTERVAL_RULE,
  forecastInterval,
  MIN_PAIRS_FOR_INTERVAL,
  type ForecastInterval,
} from "@/lib/forecast-accuracy/interval";
import { FORECAST_MODELS, FORECAST_MODEL_LABELS } from "@/lib/forecast-accuracy/types";
import { pairFromView, type ForecastPairView } from "@/lib/forecast-accuracy/views";
import { intervalStateText } from "@/lib/forecast-accuracy/words";
import type { Basis, Fio2Forecast, PressureUnit } from "@/lib/oxygen";

/** The empirical interval's inputs, formula and source, as the other forecast bases show them. */
export function intervalBasis(interval: Extract<ForecastInterval, { kind: "empirical" }>): Basis {
  const inputs: Basis["inputs"] = {
    "checked forecasts (n)": { value: interval.n, unit: "pairs" },
    "shown range low": { value: interval.shown.low, unit: "mmHg" },
    "shown range high": { value: interval.shown.high, unit: "mmHg" },
  };
  for (const m of FORECAST_MODELS) {
    const model = interval.models[m];
    const label = FORECAST_MODEL_LABELS[m];
    inputs[`${label}: forecast P`] = { value: model.predicted, unit: "mmHg" };
    inputs[`${label}: smallest past error`] = { value: model.minError, unit: "mmHg" };
    inputs[`${label}: largest past error`] = { value: model.maxError, unit: "mmHg" };
  }
  return {
    name: "the empirical interval",
    formula:
      "per model: P − (largest error) … P − (smallest error); interval = max(0, lowest of those and the shown low) … highest of those and the shown high; error = forecast − measured",
    inputs,
    source: EMPIRICAL_INTERVAL_RULE,
    assumptions: [
      "The patient's next forecast error behaves like their past ones (exchangeable).",
      `The errors are this stay's checked forecasts (pairs); at least ${MIN_PAIRS_FOR_INTERVAL} are needed.`,
      `With ${interval.n} pairs the next error falls within the past extremes with probability (n − 1)/(n + 1) = ${formatNumber(100 * interval.nominalCoverage, 0)} %.`,
    ],
  };
}

/**
 * Beside the three models' range: the patient's empirical interval once they
 * have enough checked forecasts (the models' own past errors applied to this
 * forecast), or how many more it needs.
 */
export function EmpiricalInterval({
  forecast,
  pairs,
  pressureUnit: unit,
}: {
  forecast: Fio2Forecast;
  pairs: readonly ForecastPairView[];
  pressureUnit: PressureUnit;
}) {
  const interval = useMemo(
    () => forecastInterval(forecast, pairs.map(pairFromView)),
    [forecast, pairs],
  );
  if (interval.kind === "shown") {
    return (
      <p className="text-xs text-ink-muted" data-testid="empirical-interval-pending">
        Empirical interval:{" "}
        {intervalStateText({
          pairs: interval.n,
          minPairs: MIN_PAIRS_FOR_INTERVAL,
          active: false,
          rule: EMPIRICAL_INTERVAL_RULE,
        })}
      </p>
    );
  }
  return (
    <div
      className="rounded-md border border-accent/40 px-3 py-2"
      data-testid="empirical-interval"
      aria-labelledby="empirical-interval-heading"
      role="group"
    >
      <p id="empirical-interval-heading" className="text-sm font-medium">
        Empirical interval ({interval.n} pairs)
      </p>
      <p className="tabular text-lg font-semibold">
        PaO2 {formatPressureNumber(interval.low.pao2, unit)}–
        {formatPressureNumber(interval.high.pao2, unit)} {unit}
      </p>
      <p className="tabular text-sm">
        SpO2 {formatNumber(interval.low.spo2, 0)}–{formatNumber(interval.high.spo2, 0)} % (standard
        curve)
      </p>
      <p className="text-xs text-ink-muted">
        The three models&apos; range widened by this patient&apos;s own past forecast errors. If the
        next error behaves like these {interval.n}, the measured PaO2 lands inside at least about{" "}
        {formatNumber(100 * interval.nominalCoverage, 0)} % of the time.
      </p>
      <BasisDisclosure basis={intervalBasis(interval)} pressureUnit={unit} className="mt-1" />
    </div>
  );
}

import { SOURCES } from "../oxygen/sources";
import { ASSUMED_ARTERIOVENOUS_DIFFERENCE } from "../oxygen/forecast";
import type { MeasureBasis } from "../reports/types";
import { EMPIRICAL_INTERVAL_RULE, MIN_PAIRS_FOR_INTERVAL } from "./interval";
import { UNCHECKED_REASONS } from "./reasons";
import { DEFAULT_PAIRING_SETTINGS, type PairingSettings } from "./types";

/**
 * The basis catalogue of forecast accountability: what each number is and
 * where its definition comes from, in the shape the reports' basis view
 * already shows (MeasureBasis). Published sources are named; everything
 * else says "common practice" or "assumed".
 */

export const KARBING_2007 =
  "Karbing DS, Kjærgaard S, Smith BW, Espersen K, Allerød C, Andreassen S, Rees SE. Variation in the PaO2/FiO2 ratio with FiO2: mathematical and experimental description, and clinical relevance. Crit Care 2007;11:R118. doi:10.1186/cc6174";

const MEDIAN =
  "Medians by simple-statistics' median: the middle value, or the mean of the middle two for an even count.";

export function forecastAccuracyBasis(
  settings: PairingSettings = DEFAULT_PAIRING_SETTINGS,
): MeasureBasis[] {
  const { minMinutes, maxMinutes } = settings;
  return [
    {
      key: "pairing",
      label: "Checked forecast (pair)",
      definition: `A recorded FiO2 change with a stored forecast, paired with the first arterial gas sampled ${minMinutes}–${maxMinutes} min after it (both ends included), provided no later FiO2 or PEEP change and no order change (start, supersession, discontinuation) happened after the change and up to the gas's sampling. Changes at the same instant count in the order they were recorded. A change of flow alone does not interrupt. Venous gases are never used.`,
      source: `Assumed: ${minMinutes} min for PaO2 to settle after an FiO2 step (common practice); after ${maxMinutes} min the patient's own course may move PaO2 as much as the change did. Interruptions follow what every forecast holds fixed (PEEP and all but FiO2; lib/oxygen FORECAST_ASSUMPTIONS).`,
    },
    {
      key: "unchecked",
      label: "Unchecked changes",
      definition: `Every recorded change not paired, with one reason, in this order of precedence: ${Object.values(
        UNCHECKED_REASONS,
      )
        .map((r) => r.label.toLowerCase())
        .join("; ")}. None is left out silently.`,
      source: "The app's definition (assumed; no published source).",
    },
    {
      key: "error",
      label: "Error",
      definition:
        "Forecast PaO2 − measured PaO2 in mmHg, per model: positive when the model forecast too high.",
      source: "Common practice (signed prediction error).",
    },
    {
      key: "absoluteError",
      label: "Absolute error",
      definition: "|forecast PaO2 − measured PaO2| in mmHg, per model.",
      source: "Common practice.",
    },
    {
      key: "medianAbsoluteError",
      label: "Median absolute error",
      definition: `The median of the absolute errors of a model over the pairs. ${MEDIAN}`,
      source: "Common practice (robust to the odd wild gas).",
    },
    {
      key: "bias",
      label: "Bias",
      definition: `The median of a model's errors (and, beside it, their mean): a model that forecasts too high has a positive bias. ${MEDIAN}`,
      source: "Common practice.",
    },
    {
      key: "coverage",
      label: "Coverage of the shown range",
      definition:
        "Share of pairs whose measured PaO2 lies within the range shown with the forecast (the lowest to the highest of the three models, inclusive), with the counts below and above it. One figure for all three models: the range is theirs together.",
      source: "The app's definition (assumed; no published source).",
    },
    {
      key: "closest",
      label: "Closest model",
      definition:
        "The model with the lowest median absolute error over the pairs; at a tie, every tied model is named.",
      source: "The app's definition (assumed; no published source).",
    },
    {
      key: "fio2StepBand",
      label: "FiO2 step band",
      definition:
        "|to FiO2 − from FiO2| up to 0.05; over 0.05 up to 0.15; over 0.15. 0.05 is about the finest step titration takes; the ARDS Network tables step FiO2 by 0.1, so the middle band holds one table row and the top band several. A constant-P/F forecast should drift most in the top band, because P/F itself changes with FiO2.",
      source: `${KARBING_2007} (P/F varies with FiO2). ${SOURCES.ardsNetworkLowerPeep}. The 0.05 and 0.15 cut-offs: assumed.`,
    },
    {
      key: "calibration",
      label: "Calibration points",
      definition:
        "Forecast against measured PaO2, one point per pair and model; on the identity line a model is exact, above it the model forecast too high.",
      source: "Common practice (calibration plot).",
    },
    {
      key: "empiricalInterval",
      label: "Empirical interval",
      definition: EMPIRICAL_INTERVAL_RULE,
      source: `Assumed: the patient's next error behaves like their past ones (exchangeable); the (n − 1)/(n + 1) chance of falling within n past extremes is the distribution-free order-statistic result (common practice). The ${MIN_PAIRS_FOR_INTERVAL}-pair minimum: assumed.`,
    },
    {
      key: "modelPf",
      label: "Constant P/F model",
      definition:
        "Forecasts PaO2 at the new FiO2 by keeping PaO2/FiO2 as measured (capped at the alveolar PO2).",
      source: `${SOURCES.pfRatio} (the ratio). Why its forecasts drift as FiO2 moves: P/F is not constant across FiO2; in simulations with a shunt and ventilation/perfusion model fitted to 93 patients, the P/F disease class changed with FiO2 in 30 % of them (${KARBING_2007}).`,
    },
    {
      key: "modelAlveolarArterialRatio",
      label: "Constant a/A ratio model",
      definition:
        "Forecasts PaO2 at the new FiO2 by keeping PaO2/PAO2 as measured, with PAO2 from the alveolar gas equation.",
      source: SOURCES.arterialAlveolarRatio,
    },
    {
      key: "modelShunt",
      label: "Virtual shunt model",
      definition: `Forecasts PaO2 at the new FiO2 by keeping the virtual shunt estimated from the gas, with an assumed arterio-venous O2 content difference of ${ASSUMED_ARTERIOVENOUS_DIFFERENCE} mL/dL.`,
      source: `${SOURCES.shunt}; the ${ASSUMED_ARTERIOVENOUS_DIFFERENCE} mL/dL difference: assumed (lib/oxygen).`,
    },
  ];
}

/** The catalogue at the default window. */
export const FORECAST_ACCURACY_BASIS: readonly MeasureBasis[] =
  Object.freeze(forecastAccuracyBasis());

import { contentAtPO2 } from "./content";
import { severinghausSaturation } from "./dissociation";
import { OxygenInputError } from "./errors";
import {
  alveolarPO2,
  BODY_WATER_VAPOUR_PRESSURE,
  DEFAULT_RESPIRATORY_QUOTIENT,
  STANDARD_BAROMETRIC_PRESSURE,
} from "./gas";
import { checkRange, MIN_ALVEOLAR_PO2, RANGES } from "./ranges";

/** Used only when the blood gas lacks it, and said so in the caveats. */
export const ASSUMED_HEMOGLOBIN = 12;

/** The caveat of a forecast from a gas without haemoglobin. */
export const HEMOGLOBIN_ASSUMED_CAVEAT = `The blood gas has no haemoglobin: ${ASSUMED_HEMOGLOBIN} g/dL assumed for the shunt model.`;

/** The blood gas a forecast starts from, as the bedside and the forms hold it. */
export interface BaselineGas {
  /** FiO2 at which the gas was taken */
  fio2: number;
  /** mmHg */
  pao2: number;
  /** mmHg */
  paco2: number;
  /** g/dL; null or absent when not measured */
  hemoglobin?: number | null;
}

/**
 * The one baseline of every FiO2 forecast (the bedside proposal, the recorded
 * adjustment, the adjustment form and the oxygenation panel): the arterial gas
 * as measured, at the FiO2 it was taken at — not the setting now — with
 * ASSUMED_HEMOGLOBIN where it has none, at the unit's barometric pressure.
 */
export function forecastBaseline(
  gas: BaselineGas,
  barometricPressure?: number,
): Omit<ForecastInput, "nextFio2"> {
  return {
    fio2: gas.fio2,
    pao2: gas.pao2,
    paco2: gas.paco2,
    hemoglobin: gas.hemoglobin ?? ASSUMED_HEMOGLOBIN,
    ...(barometricPressure !== undefined ? { barometricPressure } : {}),
  };
}

/** Assumed arterio-venous O2 content difference for the shunt model, mL O2/dL. */
export const ASSUMED_ARTERIOVENOUS_DIFFERENCE = 5;

/** Always among a forecast's caveats: the engine forecasts FiO2 changes only. */
export const PEEP_NOT_FORECAST =
  "Only the FiO2 change is forecast: a PEEP change is not forecast numerically — re-measure after changing PEEP.";

export interface ForecastInput {
  /** FiO2 at which the blood gas was taken */
  fio2: number;
  /** measured PaO2, mmHg */
  pao2: number;
  /** measured PaCO2, mmHg */
  paco2: number;
  /** g/dL */
  hemoglobin: number;
  /** the proposed FiO2 */
  nextFio2: number;
  barometricPressure?: number;
  waterVapourPressure?: number;
  respiratoryQuotient?: number;
}

export interface ModelForecast {
  /** mmHg */
  pao2: number;
  /** %, from the Severinghaus curve */
  spo2: number;
}

export interface Fio2Forecast {
  models: { pf: ModelForecast; alveolarArterialRatio: ModelForecast; shunt: ModelForecast };
  /** The spread of the three models: lowest and highest PaO2 (and the SpO2 at each). */
  range: { low: ModelForecast; high: ModelForecast };
  /** PAO2 at the measured and at the proposed FiO2, mmHg */
  alveolarPO2: { current: number; next: number };
  /** Virtual shunt fraction estimated from the blood gas, 0–1 */
  shuntFraction: number;
  caveats: string[];
  /** What every forecast assumes, for the basis view. */
  assumptions: readonly string[];
}

export const FORECAST_ASSUMPTIONS: readonly string[] = Object.freeze([
  "Constant P/F: PaO2 scales with FiO2 (capped at PAO2).",
  "Constant a/A ratio: PaO2/PAO2 stays as measured (Gilbert & Keighley 1974).",
  "Shunt model: virtual shunt from the content equations with end-capillary PO2 = PAO2 and an assumed " +
    `arterio-venous O2 content difference of ${ASSUMED_ARTERIOVENOUS_DIFFERENCE} mL/dL, both kept unchanged at the new FiO2.`,
  "PEEP, cardiac output, haemoglobin, PaCO2, respiratory quotient and ventilation–perfusion matching are assumed " +
    "unchanged; SpO2 is read from the standard Severinghaus curve.",
]);

// The shunt solver brackets every PAO2 the accepted inputs can produce
// (at most 800 − 0 − 10/1.3 mmHg). A fixed bracket and a fixed number of
// halvings make the answer a monotone function of the target content, so the
// forecast can never fall when FiO2 rises, not even by rounding.
const SOLVER_HIGH = 800;

/**
 * A measured PaO2 above the alveolar PO2 computed for its own FiO2: the
 * inputs contradict each other (a wrong FiO2, PaCO2 or barometric pressure, or
 * a sample that is not arterial). Every model would start from a falsehood —
 * clamping them to PAO2 once made a wean read "235 mmHg" — so no forecast is
 * made; the message says why. An OxygenInputError, so every caller that
 * withholds a forecast on a refused input withholds this one too.
 */
export class InconsistentBloodGasError extends OxygenInputError {
  constructor(pao2: number, alveolar: number, fio2: number) {
    super({
      field: "pao2",
      value: pao2,
      min: RANGES.pao2.min,
      max: alveolar,
      unit: RANGES.pao2.unit,
    });
    this.message =
      `measured PaO2 ${mmHg(pao2)} is above the alveolar PO2 ${mmHg(alveolar)} computed at FiO2 ${fio2}: the inputs contradict each other ` +
      "(check FiO2, PaCO2, barometric pressure and that the sample is arterial), so no forecast is made from them";
  }
}
const SOLVER_HALVINGS = 52;

function solvePO2ForContent(hemoglobin: number, target: number): number {
  let low = 0;
  let high = SOLVER_HIGH;
  for (let i = 0; i < SOLVER_HALVINGS; i++) {
    const middle = (low + high) / 2;
    if (contentAtPO2(hemoglobin, middle) < target) low = middle;
    else high = middle;
  }
  return (low + high) / 2;
}

/**
 * The shunt model's arterial PO2 (mmHg) for a shunt fraction Qs (0–1) at an
 * alveolar PO2: the content deficit Cc'O2 − CaO2 = a–v difference · Qs/(1 − Qs)
 * (Berggren 1942, with the assumed 5 mL/dL a–v difference), solved for PaO2 on the
 * content equation by the same bisection the forecast uses, never above PAO2.
 * Unchecked: for the engine's own callers and simulations that keep inputs in range.
 */
export function shuntArterialPO2(
  hemoglobin: number,
  alveolar: number,
  shuntFraction: number,
): number {
  const deficit = (ASSUMED_ARTERIOVENOUS_DIFFERENCE * shuntFraction) / (1 - shuntFraction);
  return pao2ForDeficit(hemoglobin, alveolar, deficit);
}

function pao2ForDeficit(hemoglobin: number, alveolar: number, deficit: number): number {
  return Math.min(
    solvePO2ForContent(hemoglobin, contentAtPO2(hemoglobin, alveolar) - deficit),
    alveolar,
  );
}

const model = (pao2: number): ModelForecast => ({ pao2, spo2: 100 * severinghausSaturation(pao2) });
function mmHg(value: number): string {
  return `${Math.round(value)} mmHg`;
}

/**
 * Forecast PaO2 and SpO2 after a change of FiO2 alone, by three models side by
 * side (constant P/F; constant a/A ratio, Gilbert & Keighley 1974; virtual
 * shunt by the shunt equation, Berggren 1942), with their spread as the range.
 *
 * The shunt model takes end-capillary PO2 = PAO2, Cc'O2 and CaO2 from the
 * content equation, CvO2 = CaO2 − 5 mL/dL, and Qs/Qt = (Cc'O2 − CaO2)/(Cc'O2 − CvO2).
 * At the new FiO2 it keeps Qs/Qt and the 5 mL/dL a–v difference and solves
 * CaO2 = (1 − Qs/Qt)·Cc'O2new + Qs/Qt·CvO2new for PaO2 in [0, PAO2new] by
 * bisection. (With both held, the balance keeps Cc'O2 − CaO2 constant.)
 * No model exceeds PAO2 at the new FiO2; every model is non-decreasing in nextFio2.
 * A measured PaO2 above the computed PAO2 throws {@link InconsistentBloodGasError}.
 */
export function forecastFio2Change(input: ForecastInput): Fio2Forecast {
  const {
    fio2,
    pao2,
    paco2,
    hemoglobin,
    nextFio2,
    barometricPressure = STANDARD_BAROMETRIC_PRESSURE,
    waterVapourPressure = BODY_WATER_VAPOUR_PRESSURE,
    respiratoryQuotient = DEFAULT_RESPIRATORY_QUOTIENT,
  } = input;
  checkRange("pao2", pao2, RANGES.pao2);
  checkRange("hemoglobin", hemoglobin, RANGES.hemoglobin);
  const gas = { paco2, barometricPressure, waterVapourPressure, respiratoryQuotient };
  const current = alveolarPO2({ ...gas, fio2 });
  checkRange("nextFio2", nextFio2, RANGES.fio2);
  const lowestNextFio2 =
    (MIN_ALVEOLAR_PO2 + paco2 / respiratoryQuotient) / (barometricPressure - waterVapourPressure);
  if (nextFio2 < lowestNextFio2) {
    throw new OxygenInputError({
      field: "nextFio2",
      value: nextFio2,
      min: lowestNextFio2,
      max: RANGES.fio2.max,
      unit: RANGES.fio2.unit,
      reason: `with PaCO2 ${paco2} mmHg a lower FiO2 leaves no alveolar oxygen`,
    });
  }
  // Inputs are checked above; the direct form avoids re-checking PaCO2 against a
  // bound that rounding could put a hair below the one just enforced.
  const next = nextFio2 * (barometricPressure - waterVapourPressure) - paco2 / respiratoryQuotient;
  const caveats: string[] = [PEEP_NOT_FORECAST];

  if (pao2 > current) throw new InconsistentBloodGasError(pao2, current, fio2);

  const pfPao2 = (pao2 / fio2) * nextFio2;
  if (pfPao2 > next) {
    caveats.push(
      `The constant-P/F forecast (${mmHg(pfPao2)}) exceeded PAO2 ${mmHg(next)} at FiO2 ${nextFio2} and was capped at it.`,
    );
  }
  const pf = model(Math.min(pfPao2, next));

  const alveolarArterialRatio = model((pao2 / current) * next);

  const endCapillary = contentAtPO2(hemoglobin, current);
  const arterial = contentAtPO2(hemoglobin, pao2);
  const deficit = Math.max(endCapillary - arterial, 0);
  const shuntFraction = deficit / (deficit + ASSUMED_ARTERIOVENOUS_DIFFERENCE);
  const shuntPao2 = pao2ForDeficit(hemoglobin, next, deficit);
  if (shuntPao2 < MIN_ALVEOLAR_PO2) {
    caveats.push(
      `At FiO2 ${nextFio2} the estimated shunt (${Math.round(shuntFraction * 100)} %) leaves no arterial oxygen in the shunt model.`,
    );
  }
  const shunt = model(shuntPao2);

  const byPao2 = [pf, alveolarArterialRatio, shunt].sort((a, b) => a.pao2 - b.pao2);
  const low = byPao2[0] ?? pf;
  const high = byPao2[byPao2.length - 1] ?? pf;
  if (high.spo2 >= 97) {
    caveats.push(
      `Forecast PaO2 up to ${mmHg(high.pao2)} lies on the flat part of the dissociation curve (SpO2 ≥ 97 %): SpO2 will hardly change and cannot confirm it.`,
    );
  }

  return {
    models: { pf, alveolarArterialRatio, shunt },
    range: { low, high },
    alveolarPO2: { current, next },
    shuntFraction,
    caveats,
    assumptions: FORECAST_ASSUMPTIONS,
  };
}

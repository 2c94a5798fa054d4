import { po2FromSaturation, saturationFromPO2 } from "./dissociation";
import { OxygenInputError } from "./errors";
import {
  ASSUMED_HEMOGLOBIN,
  forecastBaseline,
  forecastFio2Change,
  HEMOGLOBIN_ASSUMED_CAVEAT,
  PEEP_NOT_FORECAST,
  type Fio2Forecast,
  type ForecastInput,
} from "./forecast";
import { HIGHEST_SPO2_FOR_IMPUTING } from "./imputation";
import { RANGES } from "./ranges";
import type { SettingValue } from "./step-tables";
import { checkProposeStepInput } from "./propose-step-input";
import {
  brokenLimit,
  candidates,
  describe,
  format,
  relation,
  SAME,
  withinLimits,
} from "./step-geometry";

/** One row of an order's step table: FiO2 with PEEP (ventilation, CPAP) or with flow (HFNC). */
export interface OrderStep {
  readonly fio2: SettingValue;
  /** cmH2O */
  readonly peep?: SettingValue;
  /** L/min */
  readonly flow?: number;
}

/** The ranges inside which the bedside team may titrate. */
export interface OrderLimits {
  fio2Min: number;
  fio2Max: number;
  peepMin?: number;
  peepMax?: number;
  flowMin?: number;
  flowMax?: number;
}

export interface TitrationOrder {
  /** SpO2 target band in % */
  spo2Target: { lower: number; upper: number };
  /** Optional PaO2 target band in mmHg: a fresh arterial PaO2 above it weans. */
  pao2Target?: { lower: number; upper: number } | null;
  limits: OrderLimits;
  /** Ordered from least to most support. */
  steps: readonly OrderStep[];
}

export interface CurrentSettings {
  fio2: number;
  /** cmH2O */
  peep?: number;
  /** L/min */
  flow?: number;
}

export interface LatestReading {
  /** % */
  spo2: number;
  /** FiO2 in use when the reading was taken, if it differs from the current setting */
  fio2?: number;
}

export interface LatestBloodGas {
  /** mmHg */
  pao2: number;
  /** mmHg */
  paco2: number;
  /** g/dL */
  hemoglobin?: number;
  /** FiO2 at sampling */
  fio2: number;
  /** PEEP at sampling, cmH2O */
  peep?: number;
}

export interface ProposeStepInput {
  order: TitrationOrder;
  current: CurrentSettings;
  latestReading: LatestReading;
  /** Pass only a blood gas that still represents the patient. */
  latestBloodGas?: LatestBloodGas | null;
  /** mmHg, from the unit's altitude; 760 if omitted */
  barometricPressure?: number;
  /** When SpO2 is low enough to call the prescriber now; {@link DEFAULT_URGENCY} if omitted. */
  urgency?: Urgency;
}

/** Urgent depth: SpO2 under `belowPct`, or `marginPct` points or more under the band. */
export interface Urgency {
  belowPct: number;
  marginPct: number;
}

/**
 * The thresholds alert detection grades "urgent" by (85 %, or 5 points under
 * the band): units commonly treat these as "call now" saturations (common
 * practice, not a published cut-off). The service passes the configured ones.
 */
export const DEFAULT_URGENCY: Urgency = { belowPct: 85, marginPct: 5 };

export type ProposalDirection = "up" | "down" | "hold" | "escalate";

/** A concrete setting taken from the step table (a published range resolved to one end). */
export interface ProposedSetting {
  fio2: number;
  peep?: number;
  flow?: number;
  /** 0-based index of the row in the order's step table */
  stepIndex: number;
}

export interface Proposal {
  direction: ProposalDirection;
  /** SpO2 at urgent depth: call the prescriber now, whatever the step. */
  urgent: boolean;
  /** The setting to move to; null for hold and escalate. */
  step: ProposedSetting | null;
  /** How many table settings the step moves (more than one only when urgent). */
  stepsMoved: number;
  /** The order limit that keeps the table's next setting out of reach, in words; null when none does. */
  stoppedBy: string | null;
  /** Forecast at the proposed FiO2; null when there is no step or nothing to forecast from. */
  forecast: Fio2Forecast | null;
  reason: string;
  caveats: string[];
}

/** Used only when PaO2 is imputed from SpO2 without a blood gas, and said so. */
export const ASSUMED_PACO2 = 40;

/**
 * SpO2 more than this many points under the saturation a blood gas's PaO2
 * implies means the gas no longer describes the patient: the 4 % root-mean-
 * square accuracy ISO 80601-2-61 asks of pulse oximeters over 70–100 %
 * (recalled from memory).
 */
export const GAS_SPO2_DISAGREEMENT = 4;

function forecastFor(
  input: ProposeStepInput,
  step: ProposedSetting,
  caveats: string[],
): Fio2Forecast | null {
  const { current, latestReading, latestBloodGas, barometricPressure } = input;
  const peepChanges =
    step.peep !== undefined &&
    current.peep !== undefined &&
    Math.abs(step.peep - current.peep) > SAME.peep;
  if (peepChanges) {
    caveats.push(
      `PEEP changes from ${format(current.peep ?? 0, 1)} to ${format(step.peep ?? 0, 1)} cmH2O: its effect is not forecast — re-measure after the change.`,
    );
  }
  let baseline: Omit<ForecastInput, "nextFio2">;
  if (latestBloodGas) {
    const { fio2, pao2, hemoglobin, peep } = latestBloodGas;
    if (hemoglobin === undefined) caveats.push(HEMOGLOBIN_ASSUMED_CAVEAT);
    if (Math.abs(fio2 - current.fio2) > SAME.fio2) {
      caveats.push(
        `The blood gas was taken at FiO2 ${format(fio2)}, not the current ${format(current.fio2)}: the forecast starts from the blood gas.`,
      );
    }
    if (
      peep !== undefined &&
      current.peep !== undefined &&
      Math.abs(peep - current.peep) > SAME.peep
    ) {
      caveats.push(
        `The blood gas was taken at PEEP ${format(peep, 1)} cmH2O, not the current ${format(current.peep, 1)} cmH2O.`,
      );
    }
    const implied = 100 * saturationFromPO2(pao2);
    if (latestReading.spo2 < implied - GAS_SPO2_DISAGREEMENT) {
      caveats.push(
        `The blood gas's PaO2 ${Math.round(pao2)} mmHg means a saturation of about ${Math.round(implied)} %, but SpO2 is now ${format(latestReading.spo2, 1)} %: ` +
          "the patient has worsened since the gas, so the forecast is likely optimistic.",
      );
    }
    baseline = forecastBaseline(latestBloodGas);
  } else if (latestReading.spo2 / 100 < RANGES.saturation.min) {
    caveats.push(
      `No blood gas, and SpO2 ${latestReading.spo2} % gives no PaO2 to impute: no forecast.`,
    );
    return null;
  } else if (latestReading.spo2 <= HIGHEST_SPO2_FOR_IMPUTING) {
    const pao2 = po2FromSaturation(latestReading.spo2 / 100);
    caveats.push(
      `No blood gas: PaO2 ${Math.round(pao2)} mmHg imputed from SpO2 ${latestReading.spo2} % on the standard curve (Ellis 1989), ` +
        `with PaCO2 ${ASSUMED_PACO2} mmHg and haemoglobin ${ASSUMED_HEMOGLOBIN} g/dL assumed; oximeter error of a few percent makes this rough.`,
    );
    baseline = {
      fio2: latestReading.fio2 ?? current.fio2,
      pao2,
      paco2: ASSUMED_PACO2,
      hemoglobin: ASSUMED_HEMOGLOBIN,
    };
  } else {
    caveats.push(
      `No blood gas, and SpO2 ${latestReading.spo2} % is above ${HIGHEST_SPO2_FOR_IMPUTING} %, where the curve is too flat to impute PaO2: no forecast.`,
    );
    return null;
  }
  try {
    const forecast = forecastFio2Change({ ...baseline, barometricPressure, nextFio2: step.fio2 });
    // The specific PEEP caveat above replaces the forecast's general one.
    caveats.push(
      ...forecast.caveats.filter((caveat) => !(peepChanges && caveat === PEEP_NOT_FORECAST)),
    );
    return forecast;
  } catch (error) {
    if (!(error instanceof OxygenInputError)) throw error;
    caveats.push(`No forecast: ${error.message}.`);
    return null;
  }
}

/**
 * The setting an urgent step goes to: at least two table settings up (one
 * routine step is too timid at urgent depth), and further — to the least
 * support the forecast's most pessimistic model puts at or above the band's
 * lower bound, or failing that the most support the order allows — when a
 * forecast can be made. Always within the order's limits.
 */
function urgentStep(
  input: ProposeStepInput,
  reachable: readonly ProposedSetting[],
): ProposedSetting {
  const least = Math.min(1, reachable.length - 1);
  let anyForecast = false;
  for (const candidate of reachable.slice(least)) {
    const forecast = forecastFor(input, candidate, []);
    if (!forecast) continue;
    anyForecast = true;
    if (forecast.range.low.spo2 >= input.order.spo2Target.lower) return candidate;
  }
  return anyForecast ? reachable[reachable.length - 1]! : reachable[least]!;
}

/**
 * The next step from the order's step table for the latest SpO2: below the
 * target band, the first table setting above the current one (no less FiO2,
 * PEEP or flow, more of at least one) within the order's limits, or `escalate`
 * when there is none; above the band on supplemental oxygen — or in the band
 * with a (fresh) arterial PaO2 above the order's PaO2 band — the last table
 * setting below the current one within the limits (wean); in the band, `hold`.
 * At urgent depth (below 85 %, or 5 points or more under the band, by
 * default) the proposal is urgent: call the prescriber now, and the step goes
 * more than one setting up (see urgentStep), naming the limit that stops it.
 * A published range (e.g. PEEP 18–24) offers both its ends, least support first.
 * The forecast is forecastFio2Change from the blood gas passed (the caller
 * passes only one that still represents the patient) to the proposed FiO2,
 * or from a PaO2 imputed from SpO2 ≤ 96 % when there is none.
 */
export function proposeStep(input: ProposeStepInput): Proposal {
  checkProposeStepInput(input);
  const { order, current, latestReading, latestBloodGas } = input;
  const urgency = input.urgency ?? DEFAULT_URGENCY;
  const spo2 = latestReading.spo2;
  const { lower, upper } = order.spo2Target;
  const band = `${format(lower, 1)}–${format(upper, 1)} %`;
  const reading = `SpO2 ${format(spo2, 1)} %`;
  const caveats: string[] = [];
  // One pass over the table: is the current setting a row, which settings
  // above it are within the limits (and the first one that is not), and the
  // last setting below it within them.
  let onTable = false;
  const reachable: ProposedSetting[] = [];
  let firstOutOfReach: ProposedSetting | undefined;
  let nextBelowWithinLimits: ProposedSetting | undefined;
  for (const candidate of candidates(order.steps)) {
    const relative = relation(candidate, current);
    if (relative === "same") onTable = true;
    else if (relative === "above") {
      if (withinLimits(candidate, order.limits)) {
        if (!firstOutOfReach) reachable.push(candidate);
      } else firstOutOfReach ??= candidate;
    } else if (relative === "below" && withinLimits(candidate, order.limits))
      nextBelowWithinLimits = candidate;
  }
  if (!onTable && order.steps.length > 0)
    caveats.push(`The current setting (${describe(current)}) is not a row of the step table.`);
  if (!withinLimits(current, order.limits)) {
    caveats.push(`The current setting (${describe(current)}) is outside the order's limits.`);
  }
  if (latestReading.fio2 !== undefined && Math.abs(latestReading.fio2 - current.fio2) > SAME.fio2) {
    caveats.push(
      `The reading was taken at FiO2 ${format(latestReading.fio2)}, not the current ${format(current.fio2)}.`,
    );
  }
  const position = (step: ProposedSetting) => `step ${step.stepIndex + 1} of ${order.steps.length}`;
  const stoppedBy = firstOutOfReach ? brokenLimit(firstOutOfReach, order.limits) : null;
  const base = { urgent: false, stepsMoved: 0, stoppedBy: null };

  if (spo2 < lower) {
    const urgent = spo2 < urgency.belowPct || lower - spo2 >= urgency.marginPct;
    const depth =
      spo2 < urgency.belowPct
        ? `below ${format(urgency.belowPct, 1)} %`
        : `${format(lower - spo2, 1)} points under the band`;
    const callNow = urgent
      ? `${reading} is ${depth}, below the target band ${band} (urgent): call the prescriber now.`
      : "";
    const limitWords = stoppedBy
      ? `${stoppedBy} stops the next table step (${describe(firstOutOfReach!)})`
      : null;
    if (reachable.length === 0) {
      const why =
        firstOutOfReach === undefined
          ? "the step table has no higher step"
          : (limitWords ?? "the next table step is outside the order's limits");
      return {
        ...base,
        direction: "escalate",
        urgent,
        step: null,
        forecast: null,
        stoppedBy,
        reason: urgent
          ? `${callNow} Within the order there is nothing further: ${why}.`
          : `${reading} is below the target band ${band} and ${why}: escalate to the prescriber.`,
        caveats,
      };
    }
    const step = urgent ? urgentStep(input, reachable) : reachable[0]!;
    const stepsMoved = reachable.indexOf(step) + 1;
    const forecast = forecastFor(input, step, caveats);
    const moved = stepsMoved > 1 ? `, ${stepsMoved} table settings up` : "";
    const stop = limitWords && step === reachable[reachable.length - 1] ? `; ${limitWords}` : "";
    return {
      ...base,
      direction: "up",
      urgent,
      step,
      stepsMoved,
      stoppedBy: stop ? stoppedBy : null,
      forecast,
      reason: urgent
        ? `${callNow} Meanwhile, within the order: ${describe(step)} (${position(step)}${moved})${stop}.`
        : `${reading} is below the target band ${band}: next step up is ${describe(step)} (${position(step)}).`,
      caveats,
    };
  }

  const pao2Target = order.pao2Target;
  const pao2Above =
    latestBloodGas && pao2Target && latestBloodGas.pao2 > pao2Target.upper
      ? latestBloodGas.pao2
      : null;
  if (spo2 > upper || pao2Above !== null) {
    const why =
      spo2 > upper
        ? `${reading} is above the target band ${band}`
        : `PaO2 ${Math.round(pao2Above!)} mmHg is above the PaO2 band ${format(pao2Target!.lower, 0)}–${format(pao2Target!.upper, 0)} mmHg (${reading} in band)`;
    if (
      current.fio2 <= RANGES.fio2.min + SAME.fio2 &&
      !(current.flow !== undefined && current.flow > 0)
    ) {
      return {
        ...base,
        direction: "hold",
        step: null,
        forecast: null,
        reason: `${why}, but the patient breathes room air (FiO2 0.21): nothing to wean.`,
        caveats,
      };
    }
    const step = nextBelowWithinLimits;
    if (!step) {
      return {
        ...base,
        direction: "hold",
        step: null,
        forecast: null,
        reason: `${why} on FiO2 ${format(current.fio2)}, but no lower step is within the order: hold and ask the prescriber to review the order.`,
        caveats,
      };
    }
    const forecast = forecastFor(input, step, caveats);
    return {
      ...base,
      direction: "down",
      step,
      stepsMoved: 1,
      forecast,
      reason: `${why} on FiO2 ${format(current.fio2)}: next step down (wean) is ${describe(step)} (${position(step)}).`,
      caveats,
    };
  }

  return {
    ...base,
    direction: "hold",
    step: null,
    forecast: null,
    reason: `${reading} is within the target band ${band}: hold the current settings.`,
    caveats,
  };
}

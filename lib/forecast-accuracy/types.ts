import type { Fio2Forecast } from "../oxygen/forecast";

/**
 * The plain data forecast accountability works on: one admission's recorded
 * changes, blood gases and order changes, as the database holds them, and
 * what comes out (pairs of a stored forecast with the arterial gas that
 * checks it, and every other change with the reason it stayed unchecked).
 * Pressures in mmHg, FiO2 as a fraction, times as Dates.
 */

/** One recorded adjustment with the forecast stored beside it (adjustments.forecast_json). */
export type AdjustmentEvent = {
  id: number;
  appliedAt: Date;
  fromFio2: number;
  toFio2: number;
  /** cmH2O; null on devices without PEEP */
  fromPeep: number | null;
  toPeep: number | null;
  /** the order's device, e.g. "hfnc" */
  device: string;
  forecast: Fio2Forecast | null;
};

/** One blood gas result (blood_gases). */
export type BloodGasEvent = {
  id: number;
  sampledAt: Date;
  sampleType: "arterial" | "venous";
  /** mmHg */
  pao2: number;
};

/** Any order start, supersession or discontinuation. */
export type OrderChangeEvent = { at: Date };

/** The window after a change in which an arterial gas checks its forecast. */
export type PairingSettings = { minMinutes: number; maxMinutes: number };

export const DEFAULT_PAIRING_SETTINGS: Readonly<PairingSettings> = Object.freeze({
  minMinutes: 20,
  maxMinutes: 240,
});

/** One admission's events, in any order. */
export type AdmissionEvents = {
  adjustments: readonly AdjustmentEvent[];
  bloodGases: readonly BloodGasEvent[];
  orderChanges: readonly OrderChangeEvent[];
};

/** The three models a stored forecast holds, in the order the screens show them. */
export const FORECAST_MODELS = ["pf", "alveolarArterialRatio", "shunt"] as const;
export type ForecastModel = (typeof FORECAST_MODELS)[number];

export const FORECAST_MODEL_LABELS: Readonly<Record<ForecastModel, string>> = Object.freeze({
  pf: "Constant P/F",
  alveolarArterialRatio: "Constant a/A ratio",
  shunt: "Virtual shunt",
});

/** One model's forecast against the measured PaO2, mmHg. */
export type ModelError = {
  predicted: number;
  measured: number;
  /** predicted − measured: positive when the model forecast too high */
  error: number;
  absoluteError: number;
};

/** A stored forecast and the arterial gas that checks it. */
export type ForecastPair = {
  adjustmentId: number;
  gasId: number;
  device: string;
  appliedAt: Date;
  sampledAt: Date;
  /** sampledAt − appliedAt, minutes */
  minutesAfter: number;
  fromFio2: number;
  toFio2: number;
  /** toFio2 − fromFio2, rounded to 4 decimals (FiO2 is stored with 2) */
  fio2Step: number;
  /** The change also changed PEEP, which no model forecasts (see the forecast's caveats). */
  peepChanged: boolean;
  /** measured PaO2, mmHg */
  measured: number;
  /** the range shown to the clinician: the spread of the three models, mmHg */
  range: { low: number; high: number };
  /** measured within range.low … range.high, inclusive */
  inRange: boolean;
  models: Record<ForecastModel, ModelError>;
};

export const UNCHECKED_REASON_CODES = [
  "no_forecast",
  "changed_again",
  "order_changed",
  "venous_only",
  "gas_too_early",
  "gas_too_late",
  "no_arterial_gas",
] as const;
export type UncheckedReason = (typeof UNCHECKED_REASON_CODES)[number];

/** A change whose forecast was not checked, and why. */
export type UncheckedAdjustment = {
  adjustmentId: number;
  device: string;
  appliedAt: Date;
  fromFio2: number;
  toFio2: number;
  fio2Step: number;
  reason: UncheckedReason;
  /** the reason's label from UNCHECKED_REASONS */
  label: string;
  /** this change's case in words: which gas, which change, how many minutes after */
  detail: string;
  /** the gas the reason is about (too early, too late, venous, or the one a change came before) */
  gasId: number | null;
  /** when the change or order change that came first happened */
  interruptedAt: Date | null;
};

export type PairingResult = {
  pairs: ForecastPair[];
  unchecked: UncheckedAdjustment[];
  settings: PairingSettings;
};

/**
 * Forecast accountability: each stored FiO2 forecast paired with the arterial
 * gas that checks it, every other change with its reason, summaries per model,
 * the patient's empirical interval and the basis of each measure. Pure: no
 * framework, database or I/O; plain data in, plain data out.
 */
export {
  DEFAULT_PAIRING_SETTINGS,
  FORECAST_MODELS,
  FORECAST_MODEL_LABELS,
  UNCHECKED_REASON_CODES,
  type AdjustmentEvent,
  type AdmissionEvents,
  type BloodGasEvent,
  type ForecastModel,
  type ForecastPair,
  type ModelError,
  type OrderChangeEvent,
  type PairingResult,
  type PairingSettings,
  type UncheckedAdjustment,
  type UncheckedReason,
} from "./types";
export { UNCHECKED_REASONS } from "./reasons";
export { changesFio2OrPeep, fio2Step, modelError, pairForecasts } from "./pairing";
export {
  FIO2_STEP_BANDS,
  calibrationPoints,
  fio2StepBand,
  summarizeByDevice,
  summarizeByFio2Step,
  summarizeGroups,
  summarizePairs,
  type AccuracySummary,
  type CalibrationPoint,
  type Fio2StepBand,
  type ModelSummary,
  type RangeCoverage,
} from "./summary";
export {
  EMPIRICAL_INTERVAL_RULE,
  MIN_PAIRS_FOR_INTERVAL,
  forecastInterval,
  type ForecastInterval,
  type IntervalEnd,
  type ModelInterval,
} from "./interval";
export { FORECAST_ACCURACY_BASIS, KARBING_2007, forecastAccuracyBasis } from "./basis";

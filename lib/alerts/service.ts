// The alert services, gathered: what raises alerts as clinical writes land
// (./triggers, ./pao2-alert), the clinician's steps (./clinician-steps) and the worker's
// time-driven sweeps (./sweeps).

export {
  afterOrderChanged,
  afterReadingsCharted,
  afterSettingsChanged,
  type AlertAdmission,
  type ChartedReading,
} from "./triggers";
export { afterBloodGasRecorded, type RecordedGas } from "./pao2-alert";
export { afterVentilatorCheckRecorded, type RecordedVentilatorCheck } from "./lung-protection";
export { acknowledgeAlert, resolveAlert, type AlertStepResult } from "./clinician-steps";
export { escalateDueAlerts, openOverdueReassessments, raiseSignalLosses } from "./sweeps";

// The alert services, gathered: what raises alerts as clinical writes land
// (./triggers), the clinician's steps (./clinician-steps) and the worker's
// time-driven sweeps (./sweeps).

export {
  afterBloodGasRecorded,
  afterOrderChanged,
  afterReadingsCharted,
  afterSettingsChanged,
  type AlertAdmission,
  type ChartedReading,
  type RecordedGas,
} from "./triggers";
export { acknowledgeAlert, resolveAlert, type AlertStepResult } from "./clinician-steps";
export { escalateDueAlerts, openOverdueReassessments, raiseSignalLosses } from "./sweeps";

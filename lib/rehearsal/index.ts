/**
 * Protocol rehearsal: a simulated cohort run through a unit's protocol, side
 * by side with a fixed-interval manual routine and an instant-response
 * reference. Pure and deterministic: a seed repeats a run exactly.
 *
 * What is modelled
 * - Each virtual patient has a shunt fraction that walks (a bounded
 *   Ornstein–Uhlenbeck walk around a slowly recovering baseline) with
 *   desaturation episodes, suction (ventilated patients), two-hourly position
 *   changes (each position its own shift of the baseline), haemoglobin, PaCO2, a device and an
 *   order. Arterial saturation comes from the engine itself (alveolar gas
 *   equation, lib/oxygen's shunt model, Severinghaus curve), settling toward
 *   the new steady state with a first-order lag.
 * - The monitor shows SaO2 + a per-patient bias + a slowly varying error,
 *   rounded to whole %, with motion artefacts (false drops) and probe-off gaps,
 *   at 1 Hz. Bias SD 1.5 and precision SD 1 give Arms ≈ 1.8 %, inside the 4 %
 *   ISO 80601-2-61 allows; the split is assumed.
 * - Care models on the same patients and courses: a fixed-interval routine
 *   (hourly check, one table step after a therapist's delay); the Tidemark
 *   workflow (the app's alert detection, a nurse's response with escalation
 *   when unacknowledged, a therapist applying the engine's proposal within the
 *   order); and a reference responding instantly every 30 s.
 * - Measures come from the app's own functions (rollups' minuteMeasures over
 *   time in band's carry rules), streamed an hour at a time.
 * Every figure and its source: {@link rehearsalBasis}. With the defaults the
 * fixed-interval routine's median time in band is about 71 % (30 patients ×
 * 72 h, seeds 1–3 and 2021: 69–74 %), against the published manual-titration
 * median of 71 % (BMJ Open Respir Res 2021;8:e000843); the shunt's drift
 * (0.012 per √h) and the position offsets (replaced, not summed) were set to
 * get there — both assumed, not measured.
 *
 * What it leaves out
 * - No haemodynamics: cardiac output, mixed venous content and the a–v
 *   difference are fixed (the shunt model's 5 mL/dL).
 * - PEEP and flow have no effect on the shunt: only FiO2 moves saturation.
 * - No curve shifts: PaCO2 enters the alveolar gas equation only, not the
 *   dissociation curve (no Bohr effect, temperature or pH).
 * - No blood gases: proposals impute PaO2 from SpO2 as the bedside does
 *   without a gas; no PaO2 band.
 * - Charted spot values are not added to the series: measures are the
 *   monitor's, as the Board would show them with a monitor connected.
 * - Staff are never busy with other patients (no workload coupling), and an
 *   order never changes during a stay (no prescriber review, no escalation of
 *   the order itself).
 * - No deaths, transfers or discharges: every stay runs its full length.
 */
export {
  DEFAULT_PARAMETERS,
  DEFAULT_BAND,
  defaultOrder,
  orderFor,
  rehearsalBasis,
  type BasisEntry,
  type CareParameters,
  type Delay,
  type DeviceKind,
  type OximeterParameters,
  type PatientParameters,
  type RehearsalParameters,
  type Span,
} from "./parameters";
export { Random, mixSeed } from "./random";
export {
  VirtualPatient,
  drawPatient,
  steadyPao2,
  steadySaturation,
  type PatientProfile,
} from "./patient";
export { StreamMeasures, CHUNK_MS } from "./measures";
export { CARE_MODELS, runStay, type CareModel, type SampleSink, type StayResult } from "./care";
export {
  DEFAULT_COHORT,
  PUBLISHED_MANUAL_MEDIAN_IN_RANGE,
  runRehearsal,
  summarise,
  type ModelSummary,
  type RehearsalInput,
  type RehearsalResult,
} from "./run";

import { PERCENTILE_METHOD } from "./stats";
import type { MeasureBasis } from "./types";

/**
 * The basis catalogue: what each reported number is and where its definition
 * comes from. Each report returns the entries it uses, so the page's basis
 * view and a CSV reader see the same words.
 */

const TIME_DENOMINATOR =
  "Denominator: patient time on the unit, the stays (admission → transfer or discharge) clipped to the period and to the row's shift or day.";
const ROLLUPS =
  "Counted from the per-minute rollups of the SpO2 series (lib/rollups: each reading held until the next, a manual one for at most its carry-forward limit, a monitor one for at most its gap limit), never from raw readings at report time.";
const BMJ =
  "Percentage of time in the prescribed SpO2 range: BMJ Open Respir Res 2021;8:e000843 (manual titration: median 71 % of time in range).";
const APP_EXCURSION =
  "The app's excursion rule (lib/time-in-band; DEVELOPERS.md, Excursion): below the band always counts; above it only while on supplemental oxygen (FiO2 > 0.21 or any flow), otherwise it is in band.";
const PATIENT_DAYS = "Patient-days = patient minutes on the unit in the row / 1440.";

export const BASIS = {
  patientMinutes: {
    label: "Patient time",
    definition: `Minutes patients lay on the unit. ${TIME_DENOMINATOR}`,
    source: "The app's admission stays (admission_stays).",
  },
  inBand: {
    label: "Time in band",
    definition: `Minutes (and share of patient time) the held SpO2 was within the order's target band. ${ROLLUPS}`,
    source: `${BMJ} ${APP_EXCURSION}`,
  },
  below: {
    label: "Time below band",
    definition: `Minutes (and share of patient time) the held SpO2 was below the order's lower bound. ${ROLLUPS}`,
    source: `${BMJ} ${APP_EXCURSION}`,
  },
  above: {
    label: "Time above band on oxygen",
    definition: `Minutes (and share of patient time) the held SpO2 was above the order's upper bound while on supplemental oxygen. ${ROLLUPS}`,
    source: `${BMJ} ${APP_EXCURSION}`,
  },
  unknown: {
    label: "Unknown time",
    definition:
      "Patient time with no held SpO2 or no order in effect: patient minutes − (below + in band + above). Shares of below, in band, above and unknown add up to 1.",
    source: "The app's definition.",
  },
  below88: {
    label: "Minutes below 88 %",
    definition: `Minutes the held SpO2 was below 88 %, whatever the band. ${ROLLUPS}`,
    source:
      "Hypoxaemia burden; 88 % is the lower end of common target ranges (BTS guideline for oxygen use in adults, 2017).",
  },
  below85: {
    label: "Minutes below 85 %",
    definition: `Minutes the held SpO2 was below 85 %, whatever the band. ${ROLLUPS}`,
    source:
      "Hypoxaemia burden; 85 % is the app's urgent threshold (lib/oxygen DEFAULT_URGENCY, common practice).",
  },
  belowArea: {
    label: "Area below band",
    definition: `∫ (lower bound − SpO2) dt while below the band, in %·min. ${ROLLUPS}`,
    source: "The app's definition (depth × duration of hypoxaemia).",
  },
  minSpo2: {
    label: "Lowest SpO2",
    definition: "The lowest SpO2 held in the row's time.",
    source: "Rollups (min_spo2_pct).",
  },
  gasesAbovePao2: {
    label: "Gases above PaO2 band",
    definition:
      "Arterial blood gases sampled on the unit in the period whose PaO2 is above the upper PaO2 bound of the order in effect at sampling, of those sampled while an order with a PaO2 band was in effect.",
    source: "Orders' PaO2 band (pao2_lower_mmhg / pao2_upper_mmhg); the app's definition.",
  },
  alerts: {
    label: "Alerts",
    definition:
      "Alerts opened in the period while the patient lay on the unit, by when they were opened.",
    source: "The app's alerts (lib/alerts).",
  },
  alertsPerPatientDay: {
    label: "Alerts per patient-day",
    definition: `Alerts / patient-days. ${PATIENT_DAYS}`,
    source: "The app's definition.",
  },
  toAcknowledge: {
    label: "Time to acknowledge",
    definition: `Minutes from an alert's opening to its acknowledgement, over the alerts acknowledged. ${PERCENTILE_METHOD}`,
    source: "The app's alert lifecycle (opened_at, acknowledged_at).",
  },
  toResolve: {
    label: "Time to resolve",
    definition: `Minutes from an alert's opening to its resolution, over the alerts resolved. ${PERCENTILE_METHOD}`,
    source: "The app's alert lifecycle (opened_at, resolved_at).",
  },
  escalationRate: {
    label: "Escalation rate",
    definition: "Share of alerts escalated at least once (to the therapist or the physician).",
    source: "The app's escalation ladder (escalation_level, escalated_at).",
  },
  excursionToAdjustment: {
    label: "Excursion → adjustment",
    definition: `For SpO2 below- and above-band alerts: minutes from the excursion's start (the alert's started_at) to the first adjustment of that admission applied at or after it and no later than the alert's resolution; excursions without one are left out (n says how many had one). ${PERCENTILE_METHOD}`,
    source: "The app's definition.",
  },
  patientDays: {
    label: "Patient-days",
    definition: PATIENT_DAYS,
    source: "The app's admission stays.",
  },
  oxygenHours: {
    label: "Hours on oxygen",
    definition: `Hours at an applied FiO2 above room air (0.21) while an order was in effect and a reading held (time nobody charted is not counted: a lower bound). ${ROLLUPS}`,
    source:
      "The applied settings: each order's starting FiO2 (a low-flow device's estimated from its flow), then each adjustment (lib/rollups fio2Timeline).",
  },
  fio2Hours: {
    label: "FiO2-hours above room air",
    definition:
      "∫ (FiO2 − 0.21) dt over the applied settings while a reading held, in FiO2·hours (an hour at FiO2 0.41 is 0.2).",
    source: "Cumulative oxygen exposure; the app's definition over the applied settings.",
  },
  highFio2Hours: {
    label: "Hours at FiO2 ≥ 0.6",
    definition: "Hours at an applied FiO2 of 0.6 or more while a reading held.",
    source:
      "FiO2 ≥ 0.6, the level above which oxygen toxicity is usually discussed (common practice).",
  },
  aboveOnOxygen: {
    label: "Hyperoxaemia minutes",
    definition: `Minutes above the band on supplemental oxygen (the same as time above band). ${ROLLUPS}`,
    source: APP_EXCURSION,
  },
  orders: {
    label: "Orders",
    definition:
      "Orders (not drafts) written in the period for patients lying on the unit, by when they were written.",
    source: "The app's orders.",
  },
  cosignDelay: {
    label: "Co-sign delay",
    definition: `Minutes from a verbal or telephone order's entry (created_at) to its co-signature (cosigned_at), over those co-signed. ${PERCENTILE_METHOD}`,
    source: "The app's verbal-order workflow.",
  },
  reassessments: {
    label: "Reassessments on time",
    definition:
      "While an order is in effect, a reassessment is a charted manual reading or an adjustment. Each interval from the order's start to the first reassessment, and between consecutive ones, is on time if it is at most the order's reassess_minutes. An interval is counted where it ends (the reassessment's time, on the unit, in the period); an interval that no reassessment closed is counted late at the time it fell due, once it is due before the order ended and before the end of the period (or now). Share = on time / intervals counted.",
    source:
      "The app's definition (orders.reassess_minutes; the reassessment-overdue alert uses the same clock).",
  },
  adjustmentsPerPatientDay: {
    label: "Adjustments per patient-day",
    definition: `Adjustments applied in the period while the patient lay on the unit / patient-days. ${PATIENT_DAYS}`,
    source: "The app's adjustments.",
  },
  followedProposal: {
    label: "Followed the proposal",
    definition:
      "Of the adjustments saved with an engine proposal (followed_proposal not null), the share whose applied FiO2, PEEP and flow equal the proposed step. A proposal to hold counts as not followed; no proposal (no reading yet, the engine refused, or it asked to escalate) is left out. Adjustments saved before this was recorded are left out.",
    source:
      "The bedside proposal (lib/oxygen proposeStep over the order's step table), recomputed as the adjustment is saved.",
  },
} satisfies Record<string, Omit<MeasureBasis, "key">>;

export type BasisKey = keyof typeof BASIS;

export function basisOf(keys: readonly BasisKey[]): MeasureBasis[] {
  return keys.map((key) => ({ key, ...BASIS[key] }));
}

/**
 * Facts about pulse oximetry readings that the charting, alerting and
 * time-in-band rules share, so that all of them read SpO2 the same way.
 */

/**
 * Below this SpO2 a pulse oximeter is outside the range its accuracy is stated
 * for: the ISO 80601-2-61 accuracy requirement (Arms ≤ 4 %) covers SaO2
 * 70–100 % (recollection), and 70 % is the usual floor of the stated accuracy
 * (common practice). Such values are charted and alerted, marked as less
 * accurate, never refused.
 */
export const OXIMETER_ACCURATE_FROM_PCT = 70;

/** True when an SpO2 value lies below the oximeter's stated accuracy range. */
export function belowOximeterAccuracy(spo2: number): boolean {
  return spo2 < OXIMETER_ACCURATE_FROM_PCT;
}

/** The mark shown beside such a value, in the product's words. */
export const BELOW_OXIMETER_ACCURACY_LABEL = "below oximeter accuracy";

/** What the mark means, for its tooltip and the README. */
export const OXIMETER_ACCURACY_NOTE =
  "Pulse oximeters state their accuracy for SpO2 70–100 %; below that the value is charted and alerted but may differ from the arterial saturation by more. Confirm with an arterial blood gas.";

/**
 * On supplemental oxygen: FiO2 above room air, or any oxygen flow (a
 * low-flow device's estimated FiO2 may round to 0.21). One rule for alert
 * detection and for time in band: SpO2 above the band counts as an excursion
 * only while the patient receives oxygen (the excursion rule).
 */
export function onSupplementalOxygen(setting: { fio2: number; flow?: number | null }): boolean {
  return setting.fio2 > 0.21 || (setting.flow ?? 0) > 0;
}

import { pressureIn, type PressureUnit } from "../oxygen/units";
import { DEVICE_PROFILES, DEVICES, type Device } from "../devices";
import type { RangeCoverage } from "./summary";
import type { ForecastModel } from "./types";
import type { IntervalState, PatientForecastAccuracy } from "./views";

/**
 * The words and rounded numbers the forecast-accuracy screens share (the
 * Chart panel, the adjustment form's widened range and the report). Pure:
 * the browser and the tests import it.
 */

/** The models' short names, for narrow column headers. */
export const MODEL_SHORT: Readonly<Record<ForecastModel, string>> = Object.freeze({
  pf: "P/F",
  alveolarArterialRatio: "a/A",
  shunt: "Shunt",
});

/** Decimals a pressure is shown with: whole mmHg, kPa to one decimal (as the oxygenation panel). */
export const pressureDigits = (unit: PressureUnit): number => (unit === "kPa" ? 1 : 0);

/** A pressure in mmHg converted to `unit` and rounded as shown (null stays null). */
export function pressureValue(mmHg: number | null, unit: PressureUnit): number | null {
  if (mmHg === null) return null;
  const f = 10 ** pressureDigits(unit);
  const v = Math.round(pressureIn(mmHg, unit) * f) / f;
  return Object.is(v, -0) ? 0 : v;
}

/** A pressure as text in `unit` without the unit, with a true minus sign. */
export function pressureText(mmHg: number, unit: PressureUnit): string {
  const v = pressureValue(mmHg, unit)!;
  return v.toFixed(pressureDigits(unit)).replace("-", "−");
}

/** An error (forecast − measured) as text: "+5", "−3", "0". */
export function signedPressureText(mmHg: number, unit: PressureUnit): string {
  const v = pressureValue(mmHg, unit)!;
  return v > 0 ? `+${pressureText(mmHg, unit)}` : pressureText(mmHg, unit);
}

/** "0.40 → 0.50". */
export const fio2StepText = (from: number, to: number): string =>
  `${from.toFixed(2)} → ${to.toFixed(2)}`;

/** A device's name as the screens say it; an unknown code as stored. */
export const deviceLabel = (device: string): string =>
  (DEVICES as readonly string[]).includes(device)
    ? DEVICE_PROFILES[device as Device].label
    : device;

export type RangeVerdict = "within" | "below" | "above";

/** Where the measured PaO2 fell against the range shown with the forecast (both ends inclusive). */
export function rangeVerdict(pair: {
  measured: number;
  range: { low: number; high: number };
}): RangeVerdict {
  if (pair.measured < pair.range.low) return "below";
  if (pair.measured > pair.range.high) return "above";
  return "within";
}

export const VERDICT_WORDS: Readonly<Record<RangeVerdict, string>> = Object.freeze({
  within: "Within the range",
  below: "Below the range",
  above: "Above the range",
});

/** "2 of 3 within the shown range (66.7 %); 1 below it, 0 above it". */
export function coverageText(c: RangeCoverage): string {
  if (c.n === 0) return "No checked forecast yet.";
  const share = c.share === null ? "" : ` (${(c.share * 100).toFixed(1)} %)`;
  return `${c.inRange} of ${c.n} within the shown range${share}; ${c.below} below it, ${c.above} above it.`;
}

/** The empirical interval's state in words: how many checked forecasts it still needs, or that it is in use. */
export function intervalStateText(s: IntervalState): string {
  if (s.active)
    return `Active: the adjustment form shows, beside the three models' range, the empirical interval from this patient's ${s.pairs} checked forecasts.`;
  return `${s.pairs} of ${s.minPairs} checked forecasts needed before the range widens.`;
}

/** Whether any recorded change of the admission had a forecast stored (the panel's empty state otherwise). */
export function hasStoredForecast(data: Pick<PatientForecastAccuracy, "pairs" | "unchecked">) {
  return data.pairs.length > 0 || data.unchecked.some((u) => u.reason !== "no_forecast");
}

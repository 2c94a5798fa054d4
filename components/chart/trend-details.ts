import { formatPressureNumber } from "@/components/oxygenation/format";
import { formatPfRatio, type PressureUnit } from "@/lib/oxygen/units";
import type { Trend } from "@/lib/chart/trend";
import { formatUnitTime } from "./chart-request";
import { bandAt, latestAtOrBefore } from "./trend-geometry";

export const fio2Text = (v: number) => v.toFixed(2);

/** The details of one moment, in words: what the tooltip, the live region and tests read. */
export function trendDetails(trend: Trend, t: number, pressureUnit: PressureUnit): string[] {
  const lines = [formatUnitTime(t, trend.timeZone)];
  const reading = latestAtOrBefore(trend.spo2, t);
  const band = bandAt(trend.bands, t);
  if (reading) {
    const word = band
      ? reading.spo2Pct < band.lowerPct
        ? " (below band)"
        : reading.spo2Pct > band.upperPct
          ? " (above band)"
          : " (in band)"
      : "";
    lines.push(`SpO2 ${reading.spo2Pct} %${word} at ${formatUnitTime(reading.at, trend.timeZone)}`);
  } else lines.push("No SpO2 reading yet");
  lines.push(band ? `Target band ${band.lowerPct}–${band.upperPct} %` : "No order in effect");
  const step = latestAtOrBefore(trend.settings, t);
  if (step && step.fio2 !== null) {
    const parts = [`FiO2 ${fio2Text(step.fio2)}`];
    if (step.peepCmH2O !== null) parts.push(`PEEP ${step.peepCmH2O} cmH2O`);
    if (step.flowLMin !== null) parts.push(`flow ${step.flowLMin} L/min`);
    lines.push(parts.join(", "));
  }
  const gas = latestAtOrBefore(trend.gases, t);
  if (gas) {
    lines.push(
      `Arterial gas at ${formatUnitTime(gas.at, trend.timeZone)}: PaO2 ${formatPressureNumber(gas.pao2MmHg, pressureUnit)} ${pressureUnit}` +
        (gas.pfRatio === null ? "" : `, P/F ${formatPfRatio(gas.pfRatio, pressureUnit)}`),
    );
  }
  return lines;
}

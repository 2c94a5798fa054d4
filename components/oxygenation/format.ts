import { pressureIn, type PressureUnit } from "@/lib/oxygen";

// Display helpers for the oxygenation panel. The engine computes in mmHg;
// pressures are shown in the user's unit: whole mmHg, or kPa to one decimal.

/** A pressure in mmHg as text in `unit`, without the unit. */
export function formatPressureNumber(
  valueMmHg: number,
  unit: PressureUnit,
  extraDigits = 0,
): string {
  return formatNumber(pressureIn(valueMmHg, unit), (unit === "kPa" ? 1 : 0) + extraDigits);
}

/** A fixed number of decimals, with a true minus sign and no "-0". */
export function formatNumber(value: number, digits: number): string {
  const text = value.toFixed(digits);
  const zero = Number(text) === 0;
  return (zero ? text.replace("-", "") : text).replace("-", "−");
}

/** FiO2 as a two-decimal fraction ("0.40"). */
export const formatFio2 = (fio2: number): string => fio2.toFixed(2);

/** A basis input as text in the user's unit; mmHg values keep their mmHg beside kPa. */
export function formatBasisInput(value: number, unit: string, pressureUnit: PressureUnit): string {
  if (unit === "mmHg") {
    const mmHg = `${formatNumber(value, Number.isInteger(value) ? 0 : 1)} mmHg`;
    return pressureUnit === "kPa"
      ? `${formatNumber(pressureIn(value, "kPa"), 2)} kPa (${mmHg})`
      : mmHg;
  }
  if (unit === "fraction") return formatNumber(value, 2);
  if (unit === "ratio") return formatNumber(value, Math.abs(value) >= 10 ? 0 : 2);
  return `${Number(value.toPrecision(4))} ${unit}`;
}

/** Rounds `max` up to a tidy axis end: the smallest 1, 2, 2.5 or 5 × 10ⁿ step giving at most seven steps. */
export function niceAxis(max: number): { max: number; step: number } {
  const safe = max > 0 && Number.isFinite(max) ? max : 1;
  const magnitude = 10 ** Math.floor(Math.log10(safe / 7));
  const step =
    [1, 2, 2.5, 5, 10]
      .map((m) => m * magnitude)
      .find((candidate) => Math.ceil(safe / candidate - 1e-9) <= 7) ?? 10 * magnitude;
  return { max: Math.ceil(safe / step - 1e-9) * step, step };
}

import { checkRange, RANGES } from "./ranges";

/** Severinghaus's equation without input checks, for the engine's own solvers. */
export function severinghausSaturation(po2: number): number {
  return 1 / (23400 / (po2 * po2 * po2 + 150 * po2) + 1);
}

/**
 * Oxygen saturation (fraction) of normal adult blood at a PO2 in mmHg, by
 * Severinghaus 1979: SO2 = 1 / (23400 / (PO2³ + 150·PO2) + 1). Standard curve:
 * 37 °C, pH 7.40, base excess 0, P50 26.8 mmHg; shifts of the curve are not modelled.
 */
export function saturationFromPO2(po2: number): number {
  checkRange("po2", po2, RANGES.po2);
  return severinghausSaturation(po2);
}

/**
 * PO2 in mmHg at a saturation (fraction) on the Severinghaus curve, by its
 * exact analytic inverse (Ellis 1989): with A = 11700 / (1/SO2 − 1) and
 * B = √(50³ + A²), PO2 = ∛(B + A) − ∛(B − A).
 */
export function po2FromSaturation(so2: number): number {
  checkRange("so2", so2, RANGES.saturation);
  const a = 11700 / (1 / so2 - 1);
  const c = Math.cbrt(a + Math.sqrt(125000 + a * a));
  // (B − A)(B + A) = 50³, so ∛(B − A) = 50 / ∛(B + A): avoids subtracting two
  // nearly equal numbers when the saturation is high.
  return c - 50 / c;
}

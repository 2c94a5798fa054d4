/**
 * The proposed FiO2 the Chart's forecast opens with: one step of 10 points
 * (0.10) in the direction the gas points, so a hypoxaemic patient is not
 * offered a decrease first. Hypoxaemic: SpO2 (or co-oximetry SaO2) below
 * 92 % or PaO2 below 60 mmHg — common practice thresholds, used only to pick
 * the direction of a default the clinician then sets. Otherwise weaning is
 * the usual question: one step down. At either end of the range, the other way.
 */
export const HYPOXAEMIA = { spo2Pct: 92, pao2Mmhg: 60 } as const;
const STEP = 10;

export function defaultProposedFio2Percent(
  gas: { fio2: number; pao2: number; spo2?: number; sao2?: number },
  range: { min: number; max: number },
): { percent: number; direction: "up" | "down" } {
  const current = Math.round(gas.fio2 * 100);
  const saturation = gas.spo2 ?? (gas.sao2 === undefined ? undefined : gas.sao2 * 100);
  const hypoxaemic =
    gas.pao2 < HYPOXAEMIA.pao2Mmhg || (saturation !== undefined && saturation < HYPOXAEMIA.spo2Pct);
  const up = Math.min(range.max, current + STEP);
  const down = Math.max(range.min, current - STEP);
  if (hypoxaemic) {
    return up > current ? { percent: up, direction: "up" } : { percent: down, direction: "down" };
  }
  return down < current ? { percent: down, direction: "down" } : { percent: up, direction: "up" };
}

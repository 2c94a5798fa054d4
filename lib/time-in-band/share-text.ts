/**
 * A share of time as a whole percentage that never rounds across the line
 * that matters at the bedside: a little time out of band is never "100 %" and
 * a little in band never "0 %" — those read ">99 %" and "<1 %".
 */
export function shareText(share: number): string {
  if (share > 0 && share < 0.005) return "<1 %";
  if (share > 0.995 && share < 1) return ">99 %";
  return `${Math.round(share * 100)} %`;
}

/** Nothing measured in the window: no share to give. */
export const allUnknown = (t: { unknown: number }): boolean => t.unknown >= 0.9995;

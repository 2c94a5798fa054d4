import type { OrderLimits, OrderStep, ProposedSetting } from "./propose-step";
import type { SettingValue } from "./step-tables";

// The geometry of a step table, apart from the decision that walks it: a
// published range expanded into its ends, how one setting relates to another,
// and which of the order's limits a setting breaks. Pure.

// Settings within these are the same setting (FiO2 0.3 vs 0.30000000001).
export const SAME = { fio2: 0.001, peep: 0.01, flow: 0.01 } as const;

export const ends = (value: SettingValue): readonly [number, number] =>
  typeof value === "number" ? [value, value] : value;
const distinct = ([low, high]: readonly [number, number]): number[] =>
  low === high ? [low] : [low, high];
export const format = (value: number, digits = 2): string => String(Number(value.toFixed(digits)));

/** FiO2 with the PEEP and/or flow that go with it. */
export type Setting = Pick<ProposedSetting, "fio2" | "peep" | "flow">;

export function describe(setting: Setting): string {
  const parts = [`FiO2 ${format(setting.fio2)}`];
  if (setting.peep !== undefined) parts.push(`PEEP ${format(setting.peep, 1)} cmH2O`);
  if (setting.flow !== undefined) parts.push(`flow ${format(setting.flow, 1)} L/min`);
  return parts.join(", ");
}

// A published range is a choice within one row: expand it into its two ends,
// least support first, so "next step up" can stop at the lower end.
export function candidates(steps: readonly OrderStep[]): ProposedSetting[] {
  const result: ProposedSetting[] = [];
  for (const [stepIndex, step] of steps.entries()) {
    const peeps = step.peep === undefined ? [undefined] : distinct(ends(step.peep));
    for (const fio2 of distinct(ends(step.fio2))) {
      for (const peep of peeps) result.push({ fio2, peep, flow: step.flow, stepIndex });
    }
  }
  return result;
}

function sign(a: number | undefined, b: number | undefined, tolerance: number): -1 | 0 | 1 {
  if (a === undefined || b === undefined) return 0;
  return a > b + tolerance ? 1 : a < b - tolerance ? -1 : 0;
}

/**
 * How a table setting relates to the current one, on every dimension both
 * define: `above` gives more of something and less of nothing, `below` the
 * reverse, `apart` more of one and less of another.
 */
export function relation(
  candidate: Setting,
  current: Setting,
): "same" | "above" | "below" | "apart" {
  const signs = [
    sign(candidate.fio2, current.fio2, SAME.fio2),
    sign(candidate.peep, current.peep, SAME.peep),
    sign(candidate.flow, current.flow, SAME.flow),
  ];
  const more = signs.includes(1);
  const less = signs.includes(-1);
  return more ? (less ? "apart" : "above") : less ? "below" : "same";
}

function inside(
  value: number | undefined,
  min: number | undefined,
  max: number | undefined,
  tolerance: number,
): boolean {
  return (
    value === undefined ||
    ((min === undefined || value >= min - tolerance) &&
      (max === undefined || value <= max + tolerance))
  );
}

export function withinLimits(setting: Setting, limits: OrderLimits): boolean {
  return (
    inside(setting.fio2, limits.fio2Min, limits.fio2Max, SAME.fio2) &&
    inside(setting.peep, limits.peepMin, limits.peepMax, SAME.peep) &&
    inside(setting.flow, limits.flowMin, limits.flowMax, SAME.flow)
  );
}

/** Which of the order's limits a table setting breaks, in words ("the order's FiO2 maximum 0.6"). */
export function brokenLimit(setting: Setting, limits: OrderLimits): string | null {
  const over = (value: number | undefined, max: number | undefined, tolerance: number) =>
    value !== undefined && max !== undefined && value > max + tolerance;
  const under = (value: number | undefined, min: number | undefined, tolerance: number) =>
    value !== undefined && min !== undefined && value < min - tolerance;
  if (over(setting.fio2, limits.fio2Max, SAME.fio2))
    return `the order's FiO2 maximum ${format(limits.fio2Max)}`;
  if (over(setting.peep, limits.peepMax, SAME.peep))
    return `the order's PEEP maximum ${format(limits.peepMax ?? 0, 1)} cmH2O`;
  if (over(setting.flow, limits.flowMax, SAME.flow))
    return `the order's flow maximum ${format(limits.flowMax ?? 0, 1)} L/min`;
  if (under(setting.fio2, limits.fio2Min, SAME.fio2))
    return `the order's FiO2 minimum ${format(limits.fio2Min)}`;
  if (under(setting.peep, limits.peepMin, SAME.peep))
    return `the order's PEEP minimum ${format(limits.peepMin ?? 0, 1)} cmH2O`;
  if (under(setting.flow, limits.flowMin, SAME.flow))
    return `the order's flow minimum ${format(limits.flowMin ?? 0, 1)} L/min`;
  return null;
}

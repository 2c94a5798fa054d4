import type { OrderStep, SettingValue } from "../oxygen";
import type { StepRowView } from "./queries";

const asSetting = (min: number | null, max: number | null): SettingValue | undefined =>
  min === null || max === null ? undefined : min === max ? min : [min, max];

/**
 * A stored table's rows as the engine's steps: a published range (PEEP 18–24)
 * stays a range, a single value a number.
 */
export function orderStepsOf(rows: readonly StepRowView[]): OrderStep[] {
  return rows.map((r) => {
    const peep = asSetting(r.peepMin, r.peepMax);
    return {
      fio2: asSetting(r.fio2Min, r.fio2Max)!,
      ...(peep !== undefined ? { peep } : {}),
      ...(r.flow !== null ? { flow: r.flow } : {}),
    };
  });
}

import type { ProposeStepInput } from "./propose-step";
import { checkBetween, checkRange, RANGES } from "./ranges";
import type { SettingValue } from "./step-tables";
import { ends } from "./step-geometry";

// The range checks of proposeStep's input, each naming the field and the
// range it must lie in (OxygenInputError), before any step is proposed.

function checkSetting(
  field: string,
  value: SettingValue,
  range: { min: number; max: number; unit: string },
): void {
  const [low, high] = ends(value);
  checkRange(field, low, range);
  checkBetween(field, high, low, range.max, range.unit);
}

function checkOptional(
  field: string,
  value: number | undefined,
  min: number,
  max: number,
  unit: string,
): void {
  if (value !== undefined) checkBetween(field, value, min, max, unit);
}

export function checkProposeStepInput({
  order,
  current,
  latestReading,
  latestBloodGas,
  barometricPressure,
}: ProposeStepInput): void {
  const { spo2Target, limits, steps, pao2Target } = order;
  if (pao2Target) {
    checkRange("order.pao2Target.lower", pao2Target.lower, RANGES.pao2Target);
    checkBetween(
      "order.pao2Target.upper",
      pao2Target.upper,
      pao2Target.lower,
      RANGES.pao2Target.max,
      RANGES.pao2Target.unit,
    );
  }
  checkRange("order.spo2Target.lower", spo2Target.lower, RANGES.spo2Target);
  checkBetween(
    "order.spo2Target.upper",
    spo2Target.upper,
    spo2Target.lower,
    RANGES.spo2Target.max,
    RANGES.spo2Target.unit,
  );
  checkRange("order.limits.fio2Min", limits.fio2Min, RANGES.fio2);
  checkBetween(
    "order.limits.fio2Max",
    limits.fio2Max,
    limits.fio2Min,
    RANGES.fio2.max,
    RANGES.fio2.unit,
  );
  checkOptional(
    "order.limits.peepMin",
    limits.peepMin,
    RANGES.peep.min,
    RANGES.peep.max,
    RANGES.peep.unit,
  );
  checkOptional(
    "order.limits.peepMax",
    limits.peepMax,
    limits.peepMin ?? RANGES.peep.min,
    RANGES.peep.max,
    RANGES.peep.unit,
  );
  checkOptional(
    "order.limits.flowMin",
    limits.flowMin,
    RANGES.flow.min,
    RANGES.flow.max,
    RANGES.flow.unit,
  );
  checkOptional(
    "order.limits.flowMax",
    limits.flowMax,
    limits.flowMin ?? RANGES.flow.min,
    RANGES.flow.max,
    RANGES.flow.unit,
  );
  for (const [index, step] of steps.entries()) {
    checkSetting(`order.steps[${index}].fio2`, step.fio2, RANGES.fio2);
    if (step.peep !== undefined) checkSetting(`order.steps[${index}].peep`, step.peep, RANGES.peep);
    if (step.flow !== undefined) checkRange(`order.steps[${index}].flow`, step.flow, RANGES.flow);
  }
  checkRange("current.fio2", current.fio2, RANGES.fio2);
  if (current.peep !== undefined) checkRange("current.peep", current.peep, RANGES.peep);
  if (current.flow !== undefined) checkRange("current.flow", current.flow, RANGES.flow);
  checkRange("latestReading.spo2", latestReading.spo2, RANGES.spo2);
  if (latestReading.fio2 !== undefined)
    checkRange("latestReading.fio2", latestReading.fio2, RANGES.fio2);
  if (latestBloodGas) {
    checkRange("latestBloodGas.pao2", latestBloodGas.pao2, RANGES.pao2);
    checkRange("latestBloodGas.paco2", latestBloodGas.paco2, RANGES.paco2);
    checkRange("latestBloodGas.fio2", latestBloodGas.fio2, RANGES.fio2);
    if (latestBloodGas.hemoglobin !== undefined)
      checkRange("latestBloodGas.hemoglobin", latestBloodGas.hemoglobin, RANGES.hemoglobin);
    if (latestBloodGas.peep !== undefined)
      checkRange("latestBloodGas.peep", latestBloodGas.peep, RANGES.peep);
  }
  if (barometricPressure !== undefined)
    checkRange("barometricPressure", barometricPressure, RANGES.barometricPressure);
}

import type { DetectionOptions } from "../alerts/detect";
import { DEFAULT_BAND, DEFAULT_PARAMETERS, defaultOrder } from "./parameters";
import type { RehearsalCreateInput } from "./schema";

/** The default cohort a unit rehearses: 40 patients over 72 h. */
export const DEFAULT_REHEARSAL_COHORT = { patients: 40, hours: 72 } as const;

/**
 * The form's starting figures: the site's alert settings as they run today,
 * the default cohort's band and limits, and the defaults' response times
 * (each with its source in the run's basis view).
 */
export function rehearsalFormDefaults(input: {
  unitId: number;
  /** The built-in ARDS Network lower-PEEP table's id: the default cohort's ventilated table. */
  ventilatedTableId: number;
  detection: Pick<
    DetectionOptions,
    "sustainMs" | "sustainShare" | "urgentBelowPct" | "urgentSustainMs"
  >;
  escalateAfterMinutes: number;
}): RehearsalCreateInput {
  const care = DEFAULT_PARAMETERS.care;
  const ventilated = defaultOrder("ventilator").limits;
  const hfnc = defaultOrder("hfnc").limits;
  return {
    unitId: input.unitId,
    label: "",
    ventilatedTableId: input.ventilatedTableId,
    hfncTableId: undefined,
    spo2Lower: DEFAULT_BAND.lower,
    spo2Upper: DEFAULT_BAND.upper,
    ventilatedFio2Min: ventilated.fio2Min,
    ventilatedFio2Max: ventilated.fio2Max,
    peepMin: ventilated.peepMin ?? 5,
    peepMax: ventilated.peepMax ?? 18,
    hfncFio2Min: hfnc.fio2Min,
    hfncFio2Max: hfnc.fio2Max,
    sustainSeconds: Math.round(input.detection.sustainMs / 1000),
    sustainSharePct: Math.round(input.detection.sustainShare * 100),
    urgentBelowPct: input.detection.urgentBelowPct,
    urgentSustainSeconds: Math.round(input.detection.urgentSustainMs / 1000),
    escalateAfterMinutes: input.escalateAfterMinutes,
    nurseResponseMinutes: care.nurseResponse.medianMinutes,
    therapistMinutes: care.therapist.medianMinutes,
    checkEveryMinutes: care.checkEveryMinutes,
    patients: DEFAULT_REHEARSAL_COHORT.patients,
    hours: DEFAULT_REHEARSAL_COHORT.hours,
    seed: undefined,
  };
}

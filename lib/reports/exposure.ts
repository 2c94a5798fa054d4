import type { OxygenExposureMeasures } from "./types";
import type { TimeAcc } from "./time-in-band";
import { DAY_MINUTES, minutes, round } from "./stats";

/**
 * Oxygen exposure from the same sums as time in band (the rollups carry the
 * applied FiO2 too): hours on oxygen, FiO2-hours above room air, hours at
 * FiO2 ≥ 0.6 and hyperoxaemia minutes. Pure.
 */
export function exposureMeasures(a: TimeAcc): OxygenExposureMeasures {
  return {
    patientDays: round(minutes(a.stayMs) / DAY_MINUTES, 4),
    oxygenHours: round(a.m.o2Ms / 3_600_000),
    fio2HoursAboveRoomAir: round(a.m.fio2ExcessS / 3600, 4),
    hoursAtFio2AtLeast60: round(a.m.fio2HighMs / 3_600_000),
    aboveOnOxygenMinutes: round(minutes(a.m.aboveMs)),
  };
}

import type { Knex } from "knex";
import { addMeasures, emptyMeasures, MINUTE_MS, type RollupMeasures } from "./buckets";
import { loadRollupPieces } from "./pieces";

/** What the SpO2 series and the oxygen given did over one window of a stay. */
export type StayWindowSummary = {
  label: string;
  from: string;
  to: string;
  /** Minutes of the window; below + in band + above + unknown = window. */
  windowMinutes: number;
  belowMinutes: number;
  inBandMinutes: number;
  aboveMinutes: number;
  unknownMinutes: number;
  below88Minutes: number;
  below85Minutes: number;
  /** Area below the band, %·min. */
  belowAreaPctMin: number;
  minSpo2: number | null;
  /** ∫ (FiO2 − 0.21) dt over the known time, FiO2-hours. */
  fio2HoursAboveRoomAir: number;
  hoursAtFio2AtLeast60: number;
};

const minutes = (ms: number) => ms / MINUTE_MS;

function summarise(label: string, from: number, to: number, m: RollupMeasures): StayWindowSummary {
  const window = Math.max(0, to - from);
  const known = m.belowMs + m.inBandMs + m.aboveMs;
  return {
    label,
    from: new Date(from).toISOString(),
    to: new Date(to).toISOString(),
    windowMinutes: minutes(window),
    belowMinutes: minutes(m.belowMs),
    inBandMinutes: minutes(m.inBandMs),
    aboveMinutes: minutes(m.aboveMs),
    unknownMinutes: minutes(Math.max(0, window - known)),
    below88Minutes: minutes(m.below88Ms),
    below85Minutes: minutes(m.below85Ms),
    belowAreaPctMin: m.belowAreaPctS / 60,
    minSpo2: m.minSpo2,
    fio2HoursAboveRoomAir: m.fio2ExcessS / 3600,
    hoursAtFio2AtLeast60: m.fio2HighMs / 3_600_000,
  };
}

/**
 * The Chart's summary of one admission from the rollups: the last 24 h (or
 * the stay, if shorter) and the whole stay, each to the end of the minute in
 * progress — or to discharge.
 */
export async function loadStaySummary(
  knex: Knex,
  admission: { id: number; admittedAt: Date; dischargedAt: Date | null },
  now: Date = new Date(),
): Promise<StayWindowSummary[]> {
  const end = Math.ceil((admission.dischargedAt ?? now).getTime() / MINUTE_MS) * MINUTE_MS;
  const stayStart = Math.floor(admission.admittedAt.getTime() / MINUTE_MS) * MINUTE_MS;
  const dayStart = Math.max(stayStart, end - 24 * 3_600_000);
  const pieces = await loadRollupPieces(knex, {
    admissionIds: [admission.id],
    from: new Date(stayStart),
    to: new Date(end),
    cuts: [dayStart],
  });
  const day = emptyMeasures();
  const stay = emptyMeasures();
  for (const p of pieces) {
    addMeasures(stay, p.m);
    if (p.at >= dayStart) addMeasures(day, p.m);
  }
  const windows = [summarise("This stay", stayStart, end, stay)];
  if (dayStart > stayStart) windows.unshift(summarise("Last 24 h", dayStart, end, day));
  return windows;
}

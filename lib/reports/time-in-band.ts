import { addMeasures, emptyMeasures, type RollupMeasures } from "../rollups/buckets";
import type { GroupKey, TimeInBandMeasures } from "./types";
import { Rows, type Where } from "./groups";
import type { StaySegment } from "./stays";
import { minutes, round, shareOf } from "./stats";
import type { RollupSum } from "./rollups";

/**
 * Time in band, below and above it on oxygen, and unknown, with the
 * hypoxaemia burden and arterial gases above the PaO2 band. Pure: rollup
 * sums, stay segments and gases in, rows out.
 */

/** An arterial gas with the upper PaO2 bound of the order in effect when it was sampled. */
export type GasAgainstBand = {
  admissionId: number;
  at: number;
  pao2: number;
  pao2Upper: number | null;
};

export type TimeAcc = {
  stayMs: number;
  m: RollupMeasures;
  gasesWithBand: number;
  gasesAbove: number;
};

export const emptyTimeAcc = (): TimeAcc => ({
  stayMs: 0,
  m: emptyMeasures(),
  gasesWithBand: 0,
  gasesAbove: 0,
});

export function timeMeasures(a: TimeAcc): TimeInBandMeasures {
  const patientMinutes = minutes(a.stayMs);
  const belowMinutes = minutes(a.m.belowMs);
  const inBandMinutes = minutes(a.m.inBandMs);
  const aboveMinutes = minutes(a.m.aboveMs);
  const unknownMinutes = Math.max(0, patientMinutes - belowMinutes - inBandMinutes - aboveMinutes);
  const share = (x: number) => shareOf(x, patientMinutes) ?? 0;
  return {
    patientMinutes: round(patientMinutes),
    belowMinutes: round(belowMinutes),
    inBandMinutes: round(inBandMinutes),
    aboveMinutes: round(aboveMinutes),
    unknownMinutes: round(unknownMinutes),
    below: share(belowMinutes),
    inBand: share(inBandMinutes),
    above: share(aboveMinutes),
    unknown: share(unknownMinutes),
    below88Minutes: round(minutes(a.m.below88Ms)),
    below85Minutes: round(minutes(a.m.below85Ms)),
    belowAreaPctMin: round(a.m.belowAreaPctS / 60),
    minSpo2: a.m.minSpo2,
    gasesAbovePao2Band: a.gasesAbove,
    gasesWithPao2Band: a.gasesWithBand,
  };
}

/**
 * Sums stays, pieces and gases into the summary and the rows. `group` gives
 * a moment's row (null: outside every row); `locate` where an admission lay
 * at a moment (null: not on the unit in the period).
 */
export function timeInBandRows(input: {
  segments: readonly StaySegment[];
  /** Rollup buckets or sums inside [from, to), each at the start of its row's time. */
  pieces: readonly RollupSum[];
  gases: readonly GasAgainstBand[];
  group: (w: Where) => GroupKey | null;
  locate: (admissionId: number, at: number) => Where | null;
  from: number;
  to: number;
  /** Rows that show even when empty (each shift or day of the period). */
  always?: readonly GroupKey[];
}): { summary: TimeAcc; rows: { key: GroupKey; acc: TimeAcc }[] } {
  const summary = emptyTimeAcc();
  const rows = new Rows(emptyTimeAcc);
  for (const k of input.always ?? []) rows.ensure(k);
  for (const s of input.segments) {
    const key = input.group({ patientId: s.patientId, bedId: s.bedId, at: s.from });
    summary.stayMs += s.to - s.from;
    if (key) rows.get(key, true).stayMs += s.to - s.from;
  }
  for (const p of input.pieces) {
    addMeasures(summary.m, p.m);
    const key = input.group({ patientId: p.patientId, bedId: p.bedId, at: p.at });
    if (key) addMeasures(rows.get(key).m, p.m);
  }
  for (const g of input.gases) {
    if (g.pao2Upper === null) continue;
    const where = input.locate(g.admissionId, g.at);
    if (!where) continue;
    const above = g.pao2 > g.pao2Upper ? 1 : 0;
    summary.gasesWithBand += 1;
    summary.gasesAbove += above;
    const key = input.group(where);
    if (key) {
      const acc = rows.get(key);
      acc.gasesWithBand += 1;
      acc.gasesAbove += above;
    }
  }
  return { summary, rows: rows.entries() };
}

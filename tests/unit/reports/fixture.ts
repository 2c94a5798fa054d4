import { fio2Timeline, minuteMeasures, type OrderSettingsInput } from "@/lib/rollups/buckets";
import type { RollupPiece } from "@/lib/rollups/pieces";
import type { Stay } from "@/lib/rollups/stays";
import type { BandPeriod, SeriesReading } from "@/lib/time-in-band";

/** ms of a time on 1 Dec 2026 UTC, "HH:MM". */
export const at = (hhmm: string, day = 1): number =>
  Date.parse(`2026-12-${String(day).padStart(2, "0")}T${hhmm}:00Z`);
export const H = 3_600_000;

export const names = {
  patients: new Map([
    [10, "Ames, Ada"],
    [20, "Brook, Ben"],
  ]),
  beds: new Map([
    [100, "1"],
    [101, "2"],
    [102, "3"],
  ]),
};

/**
 * Minute pieces as the store writes them (each minute on the unit the stay
 * gives it), then only the unit's, as loadRollupPieces reads them.
 */
export function piecesOf(
  admission: {
    admissionId: number;
    series: SeriesReading[];
    bands: BandPeriod[];
    orders?: OrderSettingsInput[];
    changes?: { at: number; fio2: number }[];
  },
  stays: readonly Stay[],
  unitId: number,
  from: number,
  to: number,
): RollupPiece[] {
  const fio2 = fio2Timeline(admission.orders ?? [], admission.changes ?? []);
  const minutes = minuteMeasures({
    series: admission.series,
    bands: admission.bands,
    fio2,
    from,
    to,
  });
  const out: RollupPiece[] = [];
  for (const [minute, m] of minutes) {
    const stay = stays.find(
      (s) => s.admissionId === admission.admissionId && s.from <= minute && minute < s.to,
    );
    if (!stay || stay.unitId !== unitId) continue;
    out.push({ ...stay, at: minute, ms: 60_000, m });
  }
  return out;
}

export const manual = (t: number, spo2: number, fio2 = 0.21): SeriesReading => ({
  t,
  spo2,
  fio2,
  flow: null,
  source: "manual",
});

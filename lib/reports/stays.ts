import type { Stay } from "../rollups/stays";
import type { TimeSlot, Where } from "./groups";

/**
 * Patient time on the unit: the stays clipped to the period (and cut at
 * shift or day boundaries when rows are time slots). Pure.
 */

export type StaySegment = {
  admissionId: number;
  patientId: number;
  bedId: number;
  from: number;
  to: number;
};

/** The stays on the unit clipped to [from, to); cut at each slot boundary when slots are given. */
export function staySegments(
  stays: readonly Stay[],
  unitId: number,
  from: number,
  to: number,
  slots: readonly TimeSlot[] = [],
): StaySegment[] {
  const cuts = slots.map((s) => s.from).filter((c) => c > from && c < to);
  const out: StaySegment[] = [];
  for (const s of stays) {
    if (s.unitId !== unitId) continue;
    let a = Math.max(s.from, from);
    const b = Math.min(s.to, to);
    if (b <= a) continue;
    for (const c of cuts) {
      if (c <= a || c >= b) continue;
      out.push({
        admissionId: s.admissionId,
        patientId: s.patientId,
        bedId: s.bedId,
        from: a,
        to: c,
      });
      a = c;
    }
    out.push({
      admissionId: s.admissionId,
      patientId: s.patientId,
      bedId: s.bedId,
      from: a,
      to: b,
    });
  }
  return out;
}

/**
 * Where an admission's event at `at` happened, if it lay on the unit then
 * (an event before a transfer in, or after a transfer out, is not the unit's).
 */
export function makeLocator(
  segments: readonly StaySegment[],
): (admissionId: number, at: number) => Where | null {
  const byAdmission = new Map<number, StaySegment[]>();
  for (const s of segments) {
    const list = byAdmission.get(s.admissionId) ?? [];
    list.push(s);
    byAdmission.set(s.admissionId, list);
  }
  return (admissionId, at) => {
    const s = byAdmission.get(admissionId)?.find((x) => x.from <= at && at < x.to);
    return s ? { patientId: s.patientId, bedId: s.bedId, at } : null;
  };
}

import { wallParts } from "../time/zone";
import { nextShift, shiftAt, type ShiftPattern } from "../units/shifts";
import type { GroupKey, ReportGroup } from "./types";

/**
 * How a report's rows are cut: by patient, by bed, by the unit's shifts or by
 * its care days (a day runs from the first shift start of one day to the
 * next, on the unit's wall clock, so a day is whole shifts). Pure.
 */

/** Where something happened or lay: the patient, the bed and the time (ms). */
export type Where = { patientId: number; bedId: number; at: number };

/** A shift or day of the period: [from, to) in ms, clipped to the period. */
export type TimeSlot = { key: string; label: string; startsAt: string; from: number; to: number };

export type Names = {
  patients: ReadonlyMap<number, string>;
  beds: ReadonlyMap<number, string>;
};

const dayPattern = (p: ShiftPattern): ShiftPattern => ({ ...p, shiftHours: 24 });
const pad = (n: number) => String(n).padStart(2, "0");

function wallLabel(instant: Date, timeZone: string, withTime: boolean): string {
  const w = wallParts(instant, timeZone);
  const date = `${w.year}-${pad(w.month)}-${pad(w.day)}`;
  return withTime ? `${date} ${pad(w.hour)}:${pad(w.minute)}` : date;
}

/** The shifts (or care days) that overlap [from, to), each clipped to it. */
export function timeSlots(
  pattern: ShiftPattern,
  groupBy: "shift" | "day",
  from: number,
  to: number,
): TimeSlot[] {
  const p = groupBy === "day" ? dayPattern(pattern) : pattern;
  const out: TimeSlot[] = [];
  for (let s = shiftAt(p, new Date(from)); s.startsAt.getTime() < to; s = nextShift(p, s)) {
    const startsAt = s.startsAt.toISOString();
    const label =
      groupBy === "day"
        ? `Day of ${wallLabel(s.startsAt, p.timeZone, false)}`
        : `Shift from ${wallLabel(s.startsAt, p.timeZone, true)}`;
    out.push({
      key: `${groupBy}:${startsAt}`,
      label,
      startsAt,
      from: Math.max(from, s.startsAt.getTime()),
      to: Math.min(to, s.endsAt.getTime()),
    });
  }
  return out;
}

/**
 * The row a moment belongs to. Time slots must be sorted; a moment outside
 * every slot belongs to none.
 */
export function makeGrouper(
  groupBy: ReportGroup,
  slots: readonly TimeSlot[],
  names: Names,
): (w: Where) => GroupKey | null {
  if (groupBy === "patient")
    return (w) => ({
      key: `patient:${w.patientId}`,
      label: names.patients.get(w.patientId) ?? `Patient ${w.patientId}`,
      patientId: w.patientId,
      bedLabel: names.beds.get(w.bedId) ?? `Bed ${w.bedId}`,
    });
  if (groupBy === "bed")
    return (w) => {
      const label = names.beds.get(w.bedId) ?? `Bed ${w.bedId}`;
      return { key: `bed:${w.bedId}`, label: `Bed ${label}`, bedLabel: label };
    };
  return (w) => {
    // Binary search: slots are few, but a report groups many events.
    let lo = 0;
    let hi = slots.length - 1;
    while (lo <= hi) {
      const mid = (lo + hi) >> 1;
      const s = slots[mid]!;
      if (w.at < s.from) hi = mid - 1;
      else if (w.at >= s.to) lo = mid + 1;
      else return { key: s.key, label: s.label, startsAt: s.startsAt };
    }
    return null;
  };
}

/**
 * Accumulates measures per row: `add` finds or creates the row's
 * accumulator; `rows` lists them in first-seen order, time rows by start.
 */
export class Rows<A> {
  private readonly map = new Map<string, { key: GroupKey; acc: A }>();
  constructor(private readonly create: () => A) {}

  /** `later`: the key comes from a later stay, so a patient row shows the bed they moved to. */
  get(key: GroupKey, later = false): A {
    let entry = this.map.get(key.key);
    if (!entry) this.map.set(key.key, (entry = { key, acc: this.create() }));
    else if (later && key.bedLabel && entry.key.patientId !== undefined)
      entry.key.bedLabel = key.bedLabel;
    return entry.acc;
  }

  /** Makes sure a row exists (a shift with nobody in it still shows). */
  ensure(key: GroupKey): void {
    this.get(key);
  }

  entries(): { key: GroupKey; acc: A }[] {
    return [...this.map.values()].sort((a, b) =>
      a.key.startsAt && b.key.startsAt
        ? a.key.startsAt.localeCompare(b.key.startsAt)
        : a.key.label.localeCompare(b.key.label, "en", { numeric: true }),
    );
  }
}

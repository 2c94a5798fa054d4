import { wallParts, wallTimeToInstant } from "../time/zone";

/**
 * A unit's shifts: the day is cut into equal shifts (6, 8, 12 or 24 hours)
 * from a start written as a wall time in the unit's zone ("07:00" with 12 h
 * gives 07:00–19:00 and 19:00–07:00). Pure; assignments, the charge duty,
 * alert recipients and the demo's rolling assignments all ask it.
 */
export type ShiftPattern = {
  timeZone: string;
  /** "HH:MM", the start of the first shift of the day. */
  shiftStart: string;
  shiftHours: 6 | 8 | 12 | 24;
};

export type Shift = { startsAt: Date; endsAt: Date };

export const SHIFT_HOURS = [6, 8, 12, 24] as const;
export const SHIFT_START_PATTERN = /^([01]\d|2[0-3]):[0-5]\d$/;

const DAY_MS = 86_400_000;

/** The wall-clock starts of the shifts of the wall day `dayUtcMs` (a UTC midnight), as instants. */
function startsOfDay(pattern: ShiftPattern, dayUtcMs: number): Date[] {
  const [h, m] = pattern.shiftStart.split(":").map(Number) as [number, number];
  const starts: Date[] = [];
  for (let k = 0; k < 24 / pattern.shiftHours; k++) {
    const wall = dayUtcMs + ((h + k * pattern.shiftHours) * 60 + m) * 60_000;
    starts.push(wallTimeToInstant(wall, pattern.timeZone));
  }
  return starts;
}

/** The shift that contains `instant`. */
export function shiftAt(pattern: ShiftPattern, instant: Date): Shift {
  const p = wallParts(instant, pattern.timeZone);
  const today = Date.UTC(p.year, p.month - 1, p.day);
  // Yesterday's late shift may still run; tomorrow's first start ends today's last.
  const starts = [
    ...startsOfDay(pattern, today - DAY_MS),
    ...startsOfDay(pattern, today),
    ...startsOfDay(pattern, today + DAY_MS),
  ];
  let index = 0;
  for (let i = 0; i < starts.length; i++) {
    if (starts[i]!.getTime() <= instant.getTime()) index = i;
  }
  return { startsAt: starts[index]!, endsAt: starts[index + 1]! };
}

export function nextShift(pattern: ShiftPattern, shift: Shift): Shift {
  return shiftAt(pattern, shift.endsAt);
}

export function previousShift(pattern: ShiftPattern, shift: Shift): Shift {
  return shiftAt(pattern, new Date(shift.startsAt.getTime() - 1));
}

/** Whether `instant` is exactly the start of one of the unit's shifts. */
export function isShiftStart(pattern: ShiftPattern, instant: Date): boolean {
  return shiftAt(pattern, instant).startsAt.getTime() === instant.getTime();
}

/**
 * "current", "next" or a shift's start instant → the shift; null for a time
 * that is not a shift start of this unit.
 */
export function resolveShift(
  pattern: ShiftPattern,
  which: "current" | "next" | "previous" | Date,
  now: Date,
): Shift | null {
  const current = shiftAt(pattern, now);
  if (which === "current") return current;
  if (which === "next") return nextShift(pattern, current);
  if (which === "previous") return previousShift(pattern, current);
  return isShiftStart(pattern, which) ? shiftAt(pattern, which) : null;
}

// The alert conditions that are not about SpO2 itself: the order's limits
// reached, and a reassessment overdue. Pure, like ./detect.

/**
 * Order limits exhausted: the patient is below the band and the bedside is
 * already at the order's ceiling for FiO2, PEEP or flow — titrating further
 * needs a new order, so the physician is needed. Returns which limits are at
 * their maximum, or an empty list.
 */
export function exhaustedLimits(
  settings: { fio2: number; fio2Estimated: boolean; peep: number | null; flow: number | null },
  limits: { fio2Max: number; peepMax: number | null; flowMax: number | null },
): ("fio2" | "peep" | "flow")[] {
  const out: ("fio2" | "peep" | "flow")[] = [];
  // An estimated FiO2 (low-flow device) is not a setting; the flow is.
  if (!settings.fio2Estimated && settings.fio2 >= limits.fio2Max - 1e-9) out.push("fio2");
  if (limits.peepMax !== null && settings.peep !== null && settings.peep >= limits.peepMax - 1e-9)
    out.push("peep");
  if (limits.flowMax !== null && settings.flow !== null && settings.flow >= limits.flowMax - 1e-9)
    out.push("flow");
  return out;
}

/**
 * Reassessment overdue: the order's interval has passed since the last
 * reassessment (a charted reading, an adjustment). Returns the minutes past
 * due, or null when not overdue.
 */
export function reassessmentOverdueMinutes(
  lastReassessedAt: number,
  reassessMinutes: number,
  now: number,
): number | null {
  const due = reassessmentDueAt(lastReassessedAt, reassessMinutes);
  return now > due ? Math.floor((now - due) / 60_000) : null;
}

/** When the next reassessment falls due: the last one plus the order's interval (ms). */
export function reassessmentDueAt(lastReassessedAt: number, reassessMinutes: number): number {
  return lastReassessedAt + reassessMinutes * 60_000;
}

/**
 * "Due soon": not yet overdue (the sweep opens "reassessment overdue" only
 * past the due time) and due within `windowMinutes`. Returns the whole
 * minutes left, or null when it is not due soon.
 */
export function reassessmentDueSoonMinutes(
  lastReassessedAt: number,
  reassessMinutes: number,
  now: number,
  windowMinutes: number,
): number | null {
  const due = reassessmentDueAt(lastReassessedAt, reassessMinutes);
  if (reassessmentOverdueMinutes(lastReassessedAt, reassessMinutes, now) !== null) return null;
  return due - now <= windowMinutes * 60_000 ? Math.floor((due - now) / 60_000) : null;
}

import type { Duty } from "./schema";

// Pure rules shared by "copy from the previous shift" and the roll forward:
// who may fill a cell, and which of a source shift's cells carry over.

export type StaffMember = { id: number; name: string; role: string };
export type FilledCell = { bedId: number; duty: Duty; userId: number };

/** A duty is held by a user of the same role (nurse duty → nurse, …). */
export function fitsDuty(staff: readonly StaffMember[], userId: number, duty: Duty): boolean {
  return staff.some((s) => s.id === userId && s.role === duty);
}

export const cellKey = (bedId: number, duty: Duty) => `${bedId}:${duty}`;

/**
 * The source's cells that fill the target's empty ones: same bed (still an
 * active bed of the unit), same person (still active on the unit, same role).
 */
export function cellsToCopy(input: {
  source: readonly FilledCell[];
  target: readonly FilledCell[];
  bedIds: readonly number[];
  staff: readonly StaffMember[];
}): FilledCell[] {
  const taken = new Set(input.target.map((c) => cellKey(c.bedId, c.duty)));
  const beds = new Set(input.bedIds);
  return input.source.filter(
    (c) =>
      !taken.has(cellKey(c.bedId, c.duty)) &&
      beds.has(c.bedId) &&
      fitsDuty(input.staff, c.userId, c.duty),
  );
}

/** The source's charge nurse carries over when the target has none and she is still a nurse of the unit. */
export function chargeToCopy(input: {
  source: number | null;
  target: number | null;
  staff: readonly StaffMember[];
}): number | null {
  if (input.target !== null || input.source === null) return null;
  return fitsDuty(input.staff, input.source, "nurse") ? input.source : null;
}

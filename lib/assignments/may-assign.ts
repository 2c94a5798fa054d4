import type { Role } from "../auth/roles";

// Who may set a shift's assignments (pure, so the page and the service ask the
// same question). The permission row "assignment.manage" lets nurses and admins
// through the door; this predicate decides for the unit and the shift.

/** Where the shift lies relative to now. */
export type ShiftPlace = "past" | "current" | "next" | "later";

export type AssignDecision =
  | { allowed: true; basis: "admin" | "charge" }
  | { allowed: false; status: 400 | 403; reason: string };

export const ONLY_CHARGE_OR_ADMIN =
  "Only the unit's charge nurse of the current shift or an administrator sets assignments.";

export function mayAssign(input: {
  role: Role;
  /** The actor holds the unit's charge duty for the current shift. */
  isCurrentCharge: boolean;
  place: ShiftPlace;
}): AssignDecision {
  if (input.role !== "admin" && !(input.role === "nurse" && input.isCurrentCharge)) {
    return { allowed: false, status: 403, reason: ONLY_CHARGE_OR_ADMIN };
  }
  if (input.place === "past") {
    return {
      allowed: false,
      status: 400,
      reason: "This shift is over: past shifts are history and cannot be changed.",
    };
  }
  if (input.place === "later") {
    return {
      allowed: false,
      status: 400,
      reason: "Only the current and the next shift can be set.",
    };
  }
  return { allowed: true, basis: input.role === "admin" ? "admin" : "charge" };
}

/** The words beside the grid: who may edit it and why. */
export function assignWords(decision: AssignDecision): string {
  if (!decision.allowed) return decision.reason;
  return decision.basis === "admin"
    ? "You may edit this shift as an administrator of the unit."
    : "You may edit this shift as the unit's charge nurse of the current shift.";
}

export function placeOf(
  startsAt: Date,
  current: { startsAt: Date },
  next: { startsAt: Date },
): ShiftPlace {
  const t = startsAt.getTime();
  if (t === current.startsAt.getTime()) return "current";
  if (t === next.startsAt.getTime()) return "next";
  return t < current.startsAt.getTime() ? "past" : "later";
}

import { ValidationError } from "../errors";
import {
  isShiftStart,
  nextShift,
  previousShift,
  shiftAt,
  type Shift,
  type ShiftPattern,
} from "../units/shifts";

/**
 * Which handover a handoff is about. Pure. A handover is named by the shift
 * handed TO: "next" (the current shift hands over to the next one), or a
 * shift's start instant. The shift that has just started is still accepted
 * during its first hour, so a nurse who arrives at 07:05 can acknowledge the
 * 07:00 handover; any other shift is refused.
 */
export type Handover = { outgoing: Shift; incoming: Shift };
export type HandoverChoice = "next" | Date;

/** How long after a shift starts its handover can still be read and acknowledged (1 h). */
export const LATE_HANDOVER_MS = 60 * 60_000;

const hhmm = (p: ShiftPattern) => `${p.shiftStart}, every ${p.shiftHours} h`;

export function resolveHandover(pattern: ShiftPattern, which: HandoverChoice, now: Date): Handover {
  const current = shiftAt(pattern, now);
  const next = nextShift(pattern, current);
  if (which === "next") return { outgoing: current, incoming: next };
  if (!isShiftStart(pattern, which)) {
    const message = `${which.toISOString()} is not the start of a shift on this unit (shifts start at ${hhmm(pattern)}).`;
    throw new ValidationError(message, { shift: [message] });
  }
  const t = which.getTime();
  if (t === next.startsAt.getTime()) return { outgoing: current, incoming: next };
  if (t === current.startsAt.getTime() && now.getTime() < t + LATE_HANDOVER_MS)
    return { outgoing: previousShift(pattern, current), incoming: current };
  const message = `Only the handover to the next shift (starting ${next.startsAt.toISOString()}) can be used, or the one to the current shift during its first hour.`;
  throw new ValidationError(message, { shift: [message] });
}

/** The handover to the current shift while it is still in its first hour, else null. */
export function lateHandover(pattern: ShiftPattern, now: Date): Handover | null {
  const current = shiftAt(pattern, now);
  return now.getTime() < current.startsAt.getTime() + LATE_HANDOVER_MS
    ? { outgoing: previousShift(pattern, current), incoming: current }
    : null;
}

/** The window of the outgoing shift so far: [its start, now], never past its end. */
export function outgoingWindow(handover: Handover, now: Date): { from: Date; to: Date } {
  const end = Math.min(now.getTime(), handover.outgoing.endsAt.getTime());
  return {
    from: handover.outgoing.startsAt,
    to: new Date(Math.max(end, handover.outgoing.startsAt.getTime())),
  };
}

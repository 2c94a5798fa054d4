import { randomUUID } from "node:crypto";
import type { Knex } from "knex";
import { getEnv } from "../env";
import { UnauthenticatedError } from "../errors";

/**
 * Sessions that can be ended. The signed session cookie carries a session id;
 * the row in `user_sessions` is what makes it valid. The guard checks it on
 * every request, so sign-out, a password reset, a role or unit change and
 * deactivation end a session at once, and a session left idle longer than
 * SESSION_IDLE_MINUTES ends at its next use.
 */

export type SessionEndReason =
  "sign_out" | "idle" | "password_changed" | "role_or_units_changed" | "deactivated";

/** Shown on the sign-in page, by reason (`/sign-in?ended=…`). */
export const SESSION_ENDED_MESSAGES: Record<"idle" | "ended", string> = {
  idle: "You were signed out after a while without activity. Sign in again; what you had typed in an open form is still there in that tab.",
  ended:
    "Your session was ended (signed out elsewhere, or your account changed). Sign in again to continue.",
};

/** The session was ended or idled out; `reason` picks the sign-in page's words. */
export class SessionEndedError extends UnauthenticatedError {
  constructor(readonly reason: "idle" | "ended") {
    super(SESSION_ENDED_MESSAGES[reason]);
  }
}

// last_seen_at is written at most this often: one small write a minute per session.
const TOUCH_EVERY_MS = 60_000;

export async function startSession(knex: Knex, userId: number, now = new Date()): Promise<string> {
  const id = randomUUID();
  await knex("user_sessions").insert({ id, user_id: userId, created_at: now, last_seen_at: now });
  return id;
}

/** Refuses an ended, foreign or idle session, and notes this use of a live one. */
export async function checkSession(
  knex: Knex,
  sessionId: string,
  userId: number,
  now = new Date(),
): Promise<void> {
  const row = (await knex("user_sessions")
    .where({ id: sessionId })
    .first("user_id", "last_seen_at", "ended_at")) as
    { user_id: number; last_seen_at: Date; ended_at: Date | null } | undefined;
  if (!row || row.user_id !== userId || row.ended_at !== null) throw new SessionEndedError("ended");
  const idleMs = getEnv().SESSION_IDLE_MINUTES * 60_000;
  const lastSeen = new Date(row.last_seen_at).getTime();
  if (now.getTime() - lastSeen > idleMs) {
    await endSession(knex, sessionId, "idle", now);
    throw new SessionEndedError("idle");
  }
  if (now.getTime() - lastSeen >= TOUCH_EVERY_MS) {
    await knex("user_sessions")
      .where({ id: sessionId })
      .whereNull("ended_at")
      .update({ last_seen_at: now });
  }
}

export async function endSession(
  knex: Knex,
  sessionId: string,
  reason: SessionEndReason,
  now = new Date(),
): Promise<void> {
  await knex("user_sessions")
    .where({ id: sessionId })
    .whereNull("ended_at")
    .update({ ended_at: now, end_reason: reason });
}

/** Ends every open session of a user; returns how many. */
export async function endUserSessions(
  knex: Knex,
  userId: number,
  reason: SessionEndReason,
  now = new Date(),
): Promise<number> {
  return knex("user_sessions")
    .where({ user_id: userId })
    .whereNull("ended_at")
    .update({ ended_at: now, end_reason: reason });
}

import type { Knex } from "knex";
import { decoyPasswordHash, verifyPassword } from "./password";
import { isRole, type Role } from "./roles";
import { signInSchema } from "./schema";
import { checkThrottle, recordAttempt, retryWords } from "./throttle";

/** What sign-in shows for a wrong or unknown e-mail or password; it never says which. */
export const SIGN_IN_FAILED = "That e-mail and password do not match an active account.";
/** What sign-in shows when something failed on our side; the cause is logged on the server. */
export const SIGN_IN_UNAVAILABLE =
  "Sign-in is not available right now; nothing was checked. Try again in a minute.";
export const signInThrottledMessage = (seconds: number) =>
  `Too many failed sign-ins. Try again in ${retryWords(seconds)}.`;

export class SignInError extends Error {}

export type SignedInUser = { id: number; email: string; name: string; role: Role };

/**
 * Checks credentials under the account and address throttles (lib/auth/throttle).
 * Every attempt is recorded — malformed, throttled, wrong or right — before
 * the answer; if the record cannot be written the attempt fails (fail closed).
 * Failures look the same whatever the cause.
 */
export async function verifySignIn(
  knex: Knex,
  raw: unknown,
  clientIp: string,
  now: Date = new Date(),
): Promise<SignedInUser> {
  const parsed = signInSchema.safeParse(raw);
  if (!parsed.success) {
    const typed = (raw as { email?: unknown } | null)?.email;
    await recordAttempt(
      knex,
      {
        emailKey: typeof typed === "string" ? typed.trim().toLowerCase() : "",
        clientIp,
        purpose: "sign_in",
        outcome: "invalid",
      },
      now,
    );
    throw new SignInError(SIGN_IN_FAILED);
  }
  const emailKey = parsed.data.email.trim().toLowerCase();
  const verdict = await checkThrottle(knex, { emailKey, clientIp }, now);
  if (!verdict.allowed) {
    await recordAttempt(
      knex,
      { emailKey, clientIp, purpose: "sign_in", outcome: "throttled" },
      now,
    );
    throw new SignInError(signInThrottledMessage(verdict.retryAfterSeconds));
  }

  const user = (await knex("users")
    .where({ email: emailKey })
    .first("id", "email", "name", "role", "password_hash", "active")) as
    | {
        id: number;
        email: string;
        name: string;
        role: string;
        password_hash: string | null;
        active: number;
      }
    | undefined;
  const matches = await verifyPassword(
    parsed.data.password,
    user?.password_hash ?? (await decoyPasswordHash()),
  );
  // An invited user without a password yet never signs in (the decoy is no password of theirs).
  const ok = Boolean(user?.password_hash && matches && user.active && isRole(user.role));
  await recordAttempt(
    knex,
    { emailKey, clientIp, purpose: "sign_in", outcome: ok ? "ok" : "wrong" },
    now,
  );
  if (!ok || !user || !isRole(user.role)) throw new SignInError(SIGN_IN_FAILED);
  return { id: user.id, email: user.email, name: user.name, role: user.role };
}

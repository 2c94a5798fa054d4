import type { Knex } from "knex";
import { TooManyRequestsError, UnauthenticatedError, ValidationError } from "../errors";
import { appendLedger } from "../ledger/service";
import { verifyPassword } from "./password";
import { isRole } from "./roles";
import { checkThrottle, recordAttempt, retryWords } from "./throttle";
import { transact } from "../transaction";

/**
 * Signing, discontinuing, and an administrator's changes to accounts and API
 * tokens re-ask the password: a signature
 * is the signer's own act, not a left-open session's. The check shares the
 * sign-in throttle of the signer's account (a stolen session cannot guess the
 * password without limit), and every refusal is a ledger row of its own —
 * written outside the caller's transaction, so it stays when the write fails.
 */
export async function confirmPassword(
  knex: Knex,
  userId: number,
  password: string,
  now: Date = new Date(),
  /** The form field the password was typed in, and what a refusal did not do. */
  words: { field: string; notDone: string } = { field: "password", notDone: "nothing was signed" },
): Promise<void> {
  const user = (await knex("users")
    .where({ id: userId })
    .first("id", "email", "role", "password_hash")) as
    { id: number; email: string; role: string; password_hash: string | null } | undefined;
  if (!user || !isRole(user.role)) throw new UnauthenticatedError();
  const actor = { id: user.id, role: user.role };
  const emailKey = user.email.trim().toLowerCase();
  const refuse = async (
    outcome: "throttled" | "wrong",
    after: Record<string, unknown>,
  ): Promise<void> => {
    await recordAttempt(knex, { emailKey, clientIp: null, purpose: "reauth", outcome }, now);
    await transact(knex, (trx) =>
      appendLedger(
        trx,
        actor,
        {
          action: "user.reauth_refused",
          entityType: "user",
          entityId: user.id,
          after: { outcome, ...after },
        },
        now,
      ),
    );
  };

  const verdict = await checkThrottle(knex, { emailKey, clientIp: null }, now);
  if (!verdict.allowed) {
    await refuse("throttled", { retryAfterSeconds: verdict.retryAfterSeconds });
    const message = `Too many wrong passwords: password confirmation is locked for your account. Try again in ${retryWords(verdict.retryAfterSeconds)}; ${words.notDone}.`;
    throw new TooManyRequestsError(message, verdict.retryAfterSeconds, {
      [words.field]: [message],
    });
  }
  if (!user.password_hash || !(await verifyPassword(password, user.password_hash))) {
    await refuse("wrong", {});
    throw new ValidationError(`The password does not match; ${words.notDone}.`, {
      [words.field]: ["The password does not match your account."],
    });
  }
  await recordAttempt(knex, { emailKey, clientIp: null, purpose: "reauth", outcome: "ok" }, now);
}

/** An administrator's change to accounts or API tokens: the admin's own password, re-entered. */
export function confirmAdminPassword(knex: Knex, adminId: number, password: string): Promise<void> {
  return confirmPassword(knex, adminId, password, new Date(), {
    field: "currentPassword",
    notDone: "nothing was changed",
  });
}

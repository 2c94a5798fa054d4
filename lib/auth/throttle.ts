import type { Knex } from "knex";
import { getEnv } from "../env";

/**
 * Throttling of password checks — sign-in and the re-entered password that
 * signs, discontinues and changes accounts — from one record,
 * `sign_in_attempts`, where every attempt lands whatever its outcome.
 *
 * - Per account (the e-mail typed, known or not, and the signer's own
 *   account): at sign-in, after three wrong sign-in passwords each further
 *   attempt waits, doubling from 1 s up to 60 s (a typo or two costs
 *   nothing); after SIGNIN_MAX_FAILURES wrong passwords of either kind within
 *   SIGNIN_WINDOW_MINUTES the account is locked until the oldest of them
 *   leaves the window.
 * - Per client address: a progressive delay only (from 2 × SIGNIN_MAX_FAILURES
 *   failures, doubling up to 60 s), never a lockout — behind a proxy that
 *   hides addresses everyone shares one, and one attacker must not lock the
 *   whole hospital out. Rotating addresses does not help against the
 *   per-account limit.
 */

export type AttemptPurpose = "sign_in" | "reauth";
export type AttemptOutcome = "ok" | "wrong" | "throttled" | "invalid";
export type ThrottleVerdict =
  { allowed: true } | { allowed: false; retryAfterSeconds: number; scope: "account" | "address" };

const MAX_DELAY_MS = 60_000;

/** From `from` failures on, the next attempt waits 1 s, doubling with each further failure up to 60 s. */
function delayAfter(failures: number, from: number): number {
  return failures < from ? 0 : Math.min(MAX_DELAY_MS, 1000 * 2 ** (failures - from));
}

/** Pure: whether an attempt at `now` may go ahead, from the failure times (ms, ascending) in the window. */
export function throttleVerdict(input: {
  /** Every wrong password on the account (sign-in and re-entered): these lock. */
  accountFailures: readonly number[];
  /** The wrong sign-in passwords among them: these slow sign-in down. */
  accountSignInFailures: readonly number[];
  addressFailures: readonly number[];
  now: number;
  maxFailures: number;
  windowMs: number;
  /** Whether quick repeated failures wait (sign-in); a re-entered password only locks. */
  progressive: boolean;
}): ThrottleVerdict {
  const { accountFailures: acc, addressFailures: addr, now, maxFailures, windowMs } = input;
  let until = 0;
  let scope: "account" | "address" = "account";
  if (acc.length >= maxFailures) {
    until = acc[acc.length - maxFailures]! + windowMs;
  } else if (input.progressive && input.accountSignInFailures.length > 0) {
    const signIn = input.accountSignInFailures;
    until = signIn[signIn.length - 1]! + delayAfter(signIn.length, 3);
  }
  if (addr.length > 0) {
    const addressUntil = addr[addr.length - 1]! + delayAfter(addr.length, 2 * maxFailures);
    if (addressUntil > until) {
      until = addressUntil;
      scope = "address";
    }
  }
  if (until <= now) return { allowed: true };
  return { allowed: false, retryAfterSeconds: Math.ceil((until - now) / 1000), scope };
}

/** "Try again in 45 seconds." / "… in 15 minutes." */
export function retryWords(seconds: number): string {
  if (seconds < 90) return `${seconds} second${seconds === 1 ? "" : "s"}`;
  return `${Math.ceil(seconds / 60)} minutes`;
}

async function failures(
  knex: Knex,
  column: "email_key" | "client_ip",
  value: string,
  since: Date,
): Promise<{ t: number; purpose: string }[]> {
  const rows = (await knex("sign_in_attempts")
    .where(column, value)
    .andWhere("outcome", "wrong")
    .andWhere("attempted_at", ">=", since)
    .orderBy("attempted_at", "desc")
    .limit(200)
    .select("attempted_at", "purpose")) as { attempted_at: Date; purpose: string }[];
  return rows.map((r) => ({ t: new Date(r.attempted_at).getTime(), purpose: r.purpose })).reverse();
}

/** The verdict for an account key and (when known) a client address, from the record. */
export async function checkThrottle(
  knex: Knex,
  keys: { emailKey: string; clientIp: string | null },
  now: Date,
): Promise<ThrottleVerdict> {
  const env = getEnv();
  const windowMs = env.SIGNIN_WINDOW_MINUTES * 60_000;
  const since = new Date(now.getTime() - windowMs);
  const [account, address] = await Promise.all([
    failures(knex, "email_key", keys.emailKey, since),
    keys.clientIp === null
      ? Promise.resolve([])
      : failures(knex, "client_ip", keys.clientIp, since),
  ]);
  return throttleVerdict({
    accountFailures: account.map((f) => f.t),
    accountSignInFailures: account.filter((f) => f.purpose === "sign_in").map((f) => f.t),
    addressFailures: address.map((f) => f.t),
    now: now.getTime(),
    maxFailures: env.SIGNIN_MAX_FAILURES,
    windowMs,
    // A signer who mistypes is already signed in and typing in front of a patient: no waits, only the lockout.
    progressive: keys.clientIp !== null,
  });
}

/**
 * Records one attempt. Callers let a failure here propagate: no record, no
 * sign-in (fail closed).
 */
export async function recordAttempt(
  knex: Knex,
  attempt: {
    emailKey: string;
    clientIp: string | null;
    purpose: AttemptPurpose;
    outcome: AttemptOutcome;
  },
  now: Date,
): Promise<void> {
  await knex("sign_in_attempts").insert({
    email_key: attempt.emailKey.slice(0, 254),
    client_ip: (attempt.clientIp ?? "-").slice(0, 64),
    succeeded: attempt.outcome === "ok",
    outcome: attempt.outcome,
    purpose: attempt.purpose,
    attempted_at: now,
  });
}

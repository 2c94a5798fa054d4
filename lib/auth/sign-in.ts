import type { Knex } from "knex";
import { getEnv } from "../env";
import { decoyPasswordHash, verifyPassword } from "./password";
import { isRole, type Role } from "./roles";
import { signInSchema } from "./schema";

/** The only two messages sign-in ever shows; neither says whether the e-mail exists. */
export const SIGN_IN_FAILED = "That e-mail and password do not match an active account.";
export const signInThrottledMessage = (minutes: number) =>
  `Too many failed sign-ins. Wait ${minutes} minutes and try again.`;

export class SignInError extends Error {}

export type SignedInUser = { id: number; email: string; name: string; role: Role };

/**
 * Checks credentials with throttling per typed e-mail and per client address.
 * Every attempt is recorded; failures look the same whatever the cause.
 */
export async function verifySignIn(
  knex: Knex,
  raw: unknown,
  clientIp: string,
  now: Date = new Date(),
): Promise<SignedInUser> {
  const env = getEnv();
  const parsed = signInSchema.safeParse(raw);
  if (!parsed.success) throw new SignInError(SIGN_IN_FAILED);
  const emailKey = parsed.data.email.trim().toLowerCase();
  const since = new Date(now.getTime() - env.SIGNIN_WINDOW_MINUTES * 60_000);

  const [byEmail, byIp] = await Promise.all([
    countFailures(knex, "email_key", emailKey, since),
    countFailures(knex, "client_ip", clientIp, since),
  ]);
  if (byEmail >= env.SIGNIN_MAX_FAILURES || byIp >= env.SIGNIN_MAX_FAILURES * 4) {
    throw new SignInError(signInThrottledMessage(env.SIGNIN_WINDOW_MINUTES));
  }

  const user = (await knex("users")
    .where({ email: emailKey })
    .first("id", "email", "name", "role", "password_hash", "active")) as
    | { id: number; email: string; name: string; role: string; password_hash: string; active: number }
    | undefined;
  const matches = await verifyPassword(
    parsed.data.password,
    user?.password_hash ?? (await decoyPasswordHash()),
  );
  const ok = Boolean(user && matches && user.active && isRole(user.role));
  await knex("sign_in_attempts").insert({
    email_key: emailKey,
    client_ip: clientIp,
    succeeded: ok,
    attempted_at: now,
  });
  if (!ok || !user || !isRole(user.role)) throw new SignInError(SIGN_IN_FAILED);
  return { id: user.id, email: user.email, name: user.name, role: user.role };
}

async function countFailures(
  knex: Knex,
  column: "email_key" | "client_ip",
  value: string,
  since: Date,
): Promise<number> {
  const row = (await knex("sign_in_attempts")
    .where(column, value)
    .andWhere("succeeded", false)
    .andWhere("attempted_at", ">=", since)
    .count({ n: "*" })
    .first()) as { n: number | string } | undefined;
  return Number(row?.n ?? 0);
}

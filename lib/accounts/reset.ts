import { createHash } from "node:crypto";
import type { Knex } from "knex";
import { isRole } from "../auth/roles";
import { getEnv } from "../env";
import { appendLedger, SYSTEM_ACTOR } from "../ledger/service";
import { consumeQuota } from "../rate-limit";
import { transact } from "../transaction";
import { durationWords } from "./email";
import { issueAccountLink, voidOpenLinks } from "./links";
import type { ResetRequestData } from "./schema";
import { newAccountToken } from "./tokens";

/**
 * "Forgot password". The answer is the same whether or not an active account
 * uses the address, and the route gives it before the lookup (the link is
 * issued after the response), so neither its words nor its timing tell. The
 * quotas count the typed address and the client address, known or not.
 */
export function resetAnswer(): string {
  return `If an active account uses that address, an e-mail with a link to set a new password is on its way. The link works once, for ${durationWords(getEnv().RESET_LINK_MINUTES)}.`;
}

/** The quota key of a typed address: a digest, so the table holds no addresses (and fits 64 characters). */
function addressKey(email: string): string {
  return `reset:${createHash("sha256").update(email, "utf8").digest("hex").slice(0, 40)}`;
}

/** Counts one request per typed address and per client address; 429 past either quota. */
export async function countResetRequest(
  knex: Knex,
  input: ResetRequestData,
  clientIp: string,
  now: Date = new Date(),
): Promise<void> {
  await consumeQuota(knex, `reset-ip:${clientIp}`.slice(0, 64), "reset_client", now);
  await consumeQuota(knex, addressKey(input.email), "reset_account", now);
}

/**
 * Issues a reset link if an active account uses the address; otherwise does
 * nothing at all (nothing is sent to an unknown address, nothing recorded).
 * Returns whether a link was issued — for tests and logs, never for the answer.
 */
export async function issueResetLink(
  knex: Knex,
  input: ResetRequestData,
  clientIp: string,
  now: Date = new Date(),
): Promise<boolean> {
  const token = newAccountToken();
  const minutes = getEnv().RESET_LINK_MINUTES;
  return transact(knex, async (trx) => {
    const user = (await trx("users")
      .where({ email: input.email, active: true })
      .forUpdate()
      .first("id", "email", "name", "role")) as
      { id: number; email: string; name: string; role: string } | undefined;
    if (!user || !isRole(user.role)) return false;
    const voided = await voidOpenLinks(trx, user.id, ["reset"], now);
    const issued = await issueAccountLink(trx, {
      kind: "reset",
      user,
      token,
      minutes,
      createdBy: null,
      now,
    });
    await appendLedger(
      trx,
      SYSTEM_ACTOR,
      {
        action: "user.reset_request",
        entityType: "user",
        entityId: user.id,
        after: {
          tokenId: issued.tokenId,
          expiresAt: issued.expiresAt.toISOString(),
          messageId: issued.messageId,
          clientAddress: clientIp,
          ...(voided ? { earlierLinksVoided: voided } : {}),
        },
      },
      now,
    );
    return true;
  });
}

/** The whole request in one call (tests, scripts): count, issue, answer. */
export async function requestPasswordReset(
  knex: Knex,
  input: ResetRequestData,
  clientIp: string,
  now: Date = new Date(),
): Promise<{ message: string }> {
  await countResetRequest(knex, input, clientIp, now);
  await issueResetLink(knex, input, clientIp, now);
  return { message: resetAnswer() };
}

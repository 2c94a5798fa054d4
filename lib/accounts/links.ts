import type { Knex } from "knex";
import { queueUserMail } from "../alerts/outbox";
import { composeAccountEmail, durationWords } from "./email";
import { accountLink, accountMessageId, type AccountTokenKind } from "./tokens";

/** Voids a user's links that still work (a newer link, or a password now set); returns how many. */
export async function voidOpenLinks(
  trx: Knex.Transaction,
  userId: number,
  kinds: readonly AccountTokenKind[],
  now: Date,
): Promise<number> {
  return trx("account_tokens")
    .where({ user_id: userId })
    .whereIn("kind", kinds)
    .whereNull("used_at")
    .whereNull("voided_at")
    .where("expires_at", ">", now)
    .update({ voided_at: now });
}

/**
 * Stores one link (its hash) and queues its e-mail through the outbox, in the
 * caller's transaction. The Message-ID names the stored link, so a retried
 * delivery sends the same one; the secret itself goes only into the e-mail.
 */
export async function issueAccountLink(
  trx: Knex.Transaction,
  link: {
    kind: AccountTokenKind;
    user: { id: number; email: string; name: string };
    token: { token: string; hash: string };
    minutes: number;
    createdBy: number | null;
    invitedBy?: string;
    now: Date;
  },
): Promise<{ tokenId: number; expiresAt: Date; messageId: string }> {
  const expiresAt = new Date(link.now.getTime() + link.minutes * 60_000);
  const [id] = await trx("account_tokens").insert({
    user_id: link.user.id,
    kind: link.kind,
    token_hash: link.token.hash,
    created_by: link.createdBy,
    created_at: link.now,
    expires_at: expiresAt,
  });
  const tokenId = Number(id);
  const messageId = await queueUserMail(
    trx,
    link.kind === "invite" ? "account_invite" : "account_reset",
    link.user,
    ({ baseUrl, domain }) => ({
      ...composeAccountEmail({
        kind: link.kind,
        name: link.user.name,
        email: link.user.email,
        link: accountLink(baseUrl, link.token.token),
        validFor: durationWords(link.minutes),
        ...(link.invitedBy ? { invitedBy: link.invitedBy } : {}),
      }),
      messageId: accountMessageId(tokenId, link.kind, domain),
    }),
    link.now,
  );
  return { tokenId, expiresAt, messageId };
}

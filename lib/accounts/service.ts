import type { Knex } from "knex";
import type { Actor } from "../auth/actor";
import { hashPassword } from "../auth/password";
import { confirmAdminPassword, confirmPassword } from "../auth/reauth";
import { isRole } from "../auth/roles";
import { endUserSessions } from "../auth/sessions";
import { getEnv } from "../env";
import { ConflictError, NotFoundError, ValidationError } from "../errors";
import { appendLedger, SYSTEM_ACTOR } from "../ledger/service";
import { transact } from "../transaction";
import { issueAccountLink, voidOpenLinks } from "./links";
import type { ChangePasswordData, InviteData, TokenPasswordData } from "./schema";
import {
  accountTokenState,
  hashAccountToken,
  newAccountToken,
  TOKEN_REFUSALS,
  type AccountTokenKind,
  type AccountTokenState,
} from "./tokens";

export type InvitationSent = { userId: number; tokenId: number; expiresAt: string; voided: number };

type AccountRow = {
  id: number;
  email: string;
  name: string;
  role: string;
  active: number;
  password_hash: string | null;
  password_change_required: number;
};

/**
 * An invitation inside the caller's transaction (creating a user, or the
 * invite route): earlier invitations of the user stop working, the new link
 * is stored as a hash, its e-mail queued and the step recorded.
 */
export async function inviteInTransaction(
  trx: Knex.Transaction,
  actor: Actor,
  user: { id: number; email: string; name: string },
  token: { token: string; hash: string },
  now: Date,
): Promise<InvitationSent> {
  const minutes = getEnv().INVITE_LINK_HOURS * 60;
  const voided = await voidOpenLinks(trx, user.id, ["invite"], now);
  const issued = await issueAccountLink(trx, {
    kind: "invite",
    user,
    token,
    minutes,
    createdBy: actor.id,
    invitedBy: actor.name,
    now,
  });
  await appendLedger(
    trx,
    actor,
    {
      action: "user.invite",
      entityType: "user",
      entityId: user.id,
      after: {
        tokenId: issued.tokenId,
        expiresAt: issued.expiresAt.toISOString(),
        messageId: issued.messageId,
        ...(voided ? { earlierLinksVoided: voided } : {}),
      },
    },
    now,
  );
  return {
    userId: user.id,
    tokenId: issued.tokenId,
    expiresAt: issued.expiresAt.toISOString(),
    voided,
  };
}

/**
 * Sends (or sends again) an invitation to a user who has not set a password
 * of their own: none yet, or only one an administrator set.
 */
export async function inviteUser(
  knex: Knex,
  actor: Actor,
  input: InviteData,
  now: Date = new Date(),
): Promise<InvitationSent> {
  await confirmAdminPassword(knex, actor.id, input.currentPassword);
  const token = newAccountToken();
  return transact(knex, async (trx) => {
    const user = (await trx("users")
      .where({ id: input.id })
      .forUpdate()
      .first("id", "email", "name", "active", "password_hash", "password_change_required")) as
      AccountRow | undefined;
    if (!user) throw new NotFoundError("That user does not exist.");
    if (!user.active) {
      throw new ConflictError(`${user.name}'s account is deactivated: reactivate it first.`);
    }
    if (user.password_hash && !user.password_change_required) {
      throw new ConflictError(
        `${user.name} has already set a password of their own. If they forgot it, they can ask for a reset link on the sign-in page.`,
      );
    }
    return inviteInTransaction(trx, actor, user, token, now);
  });
}

/** Sets the password from an e-mailed link: once, before it expires, then every session ends. */
export async function setPasswordWithToken(
  knex: Knex,
  input: TokenPasswordData,
  now: Date = new Date(),
): Promise<{ email: string; kind: AccountTokenKind }> {
  const tokenHash = hashAccountToken(input.token);
  // bcrypt before the transaction, whatever the link: the callback may run twice.
  const passwordHash = await hashPassword(input.password);
  type Outcome =
    | { refused: Exclude<AccountTokenState, "valid"> | "unknown" }
    | { email: string; kind: AccountTokenKind };
  const outcome = await transact(knex, async (trx): Promise<Outcome> => {
    const found = await lockToken(trx, tokenHash);
    if (!found) return { refused: "unknown" };
    const state = usableState(found, now);
    if (state !== "valid") {
      await recordRefusal(trx, found, state, now);
      return { refused: state };
    }
    await trx("account_tokens").where({ id: found.id }).update({ used_at: now });
    await voidOpenLinks(trx, found.user_id, ["invite", "reset"], now);
    await trx("users")
      .where({ id: found.user_id })
      .update({
        password_hash: passwordHash,
        password_change_required: false,
        version: trx.raw("version + 1"),
        updated_at: now,
      });
    const sessionsEnded = await endUserSessions(trx, found.user_id, "password_changed", now);
    await appendLedger(
      trx,
      { id: found.user_id, role: found.role as Actor["role"] },
      {
        action: "user.password_set",
        entityType: "user",
        entityId: found.user_id,
        after: { tokenId: found.id, kind: found.kind, ...(sessionsEnded ? { sessionsEnded } : {}) },
      },
      now,
    );
    return { email: found.email, kind: found.kind };
  });
  if ("refused" in outcome) {
    const message = TOKEN_REFUSALS[outcome.refused];
    throw new ValidationError(message, { token: [message] });
  }
  return outcome;
}

type TokenRow = {
  id: number;
  user_id: number;
  kind: AccountTokenKind;
  expires_at: Date;
  used_at: Date | null;
  voided_at: Date | null;
  refused_at: Date | null;
  email: string;
  name: string;
  role: string;
  active: number;
};

async function lockToken(trx: Knex.Transaction, tokenHash: string): Promise<TokenRow | undefined> {
  return (await trx("account_tokens as t")
    .join("users as u", "u.id", "t.user_id")
    .where("t.token_hash", tokenHash)
    .forUpdate()
    .first(
      "t.id",
      "t.user_id",
      "t.kind",
      "t.expires_at",
      "t.used_at",
      "t.voided_at",
      "t.refused_at",
      "u.email",
      "u.name",
      "u.role",
      "u.active",
    )) as TokenRow | undefined;
}

/** A deactivated account's links answer as void: nothing is set on it. */
function usableState(row: TokenRow, now: Date): AccountTokenState {
  const state = accountTokenState(row, now);
  return state === "valid" && (!row.active || !isRole(row.role)) ? "voided" : state;
}

/** The first refusal of a link is a ledger row (never its secret); later ones only refuse. */
async function recordRefusal(
  trx: Knex.Transaction,
  row: TokenRow,
  state: Exclude<AccountTokenState, "valid">,
  now: Date,
): Promise<void> {
  if (row.refused_at) return;
  const marked = await trx("account_tokens")
    .where({ id: row.id })
    .whereNull("refused_at")
    .update({ refused_at: now });
  if (!marked) return;
  await appendLedger(
    trx,
    SYSTEM_ACTOR,
    {
      action: "user.account_link_refused",
      entityType: "user",
      entityId: row.user_id,
      after: { tokenId: row.id, kind: row.kind, reason: state },
    },
    now,
  );
}

export type TokenView =
  | { state: "valid"; kind: AccountTokenKind; email: string; name: string; expiresAt: string }
  | { state: Exclude<AccountTokenState, "valid"> | "unknown"; message: string };

/** What the set-password page shows for a link; a link that no longer works is recorded once. */
export async function inspectAccountToken(
  knex: Knex,
  token: string,
  now: Date = new Date(),
): Promise<TokenView> {
  if (token.length < 20 || token.length > 200) {
    return { state: "unknown", message: TOKEN_REFUSALS.unknown };
  }
  const tokenHash = hashAccountToken(token);
  return transact(knex, async (trx): Promise<TokenView> => {
    const found = await lockToken(trx, tokenHash);
    if (!found) return { state: "unknown", message: TOKEN_REFUSALS.unknown };
    const state = usableState(found, now);
    if (state !== "valid") {
      await recordRefusal(trx, found, state, now);
      return { state, message: TOKEN_REFUSALS[state] };
    }
    return {
      state,
      kind: found.kind,
      email: found.email,
      name: found.name,
      expiresAt: new Date(found.expires_at).toISOString(),
    };
  });
}

/**
 * Changes one's own password, signed in: the current password is re-asked
 * (under the sign-in throttle). Clears an administrator-set password's
 * "change at first sign-in", voids open e-mailed links and ends the user's
 * other sessions; this one stays.
 */
export async function changeOwnPassword(
  knex: Knex,
  actor: Actor,
  input: ChangePasswordData,
  now: Date = new Date(),
): Promise<{ changed: true }> {
  await confirmPassword(knex, actor.id, input.currentPassword, now, {
    field: "currentPassword",
    notDone: "your password was not changed",
  });
  const required = (await knex("users")
    .where({ id: actor.id })
    .first("password_change_required")) as { password_change_required: number } | undefined;
  if (required?.password_change_required && input.password === input.currentPassword) {
    throw new ValidationError("Choose a new password.", {
      password: ["Choose a password different from the one your administrator set."],
    });
  }
  const passwordHash = await hashPassword(input.password);
  return transact(knex, async (trx) => {
    await trx("users")
      .where({ id: actor.id })
      .update({
        password_hash: passwordHash,
        password_change_required: false,
        version: trx.raw("version + 1"),
        updated_at: now,
      });
    const voided = await voidOpenLinks(trx, actor.id, ["invite", "reset"], now);
    const others = trx("user_sessions").where({ user_id: actor.id }).whereNull("ended_at");
    if (actor.sessionId) void others.whereNot({ id: actor.sessionId });
    const sessionsEnded = await others.update({ ended_at: now, end_reason: "password_changed" });
    await appendLedger(
      trx,
      actor,
      {
        action: "user.password_change",
        entityType: "user",
        entityId: actor.id,
        after: {
          ...(required?.password_change_required ? { replacedAdministratorSet: true } : {}),
          ...(sessionsEnded ? { otherSessionsEnded: sessionsEnded } : {}),
          ...(voided ? { linksVoided: voided } : {}),
        },
      },
      now,
    );
    return { changed: true as const };
  });
}

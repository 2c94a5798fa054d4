import { createHash, randomBytes } from "node:crypto";
import type { Knex } from "knex";
import type { Actor } from "../auth/actor";
import { confirmAdminPassword } from "../auth/reauth";
import {
  ConflictError,
  DomainError,
  ForbiddenError,
  NotFoundError,
  UnauthenticatedError,
  ValidationError,
} from "../errors";
import { appendLedger } from "../ledger/service";
import { getApiToken, type ApiTokenSummary } from "./queries";
import { type ApiTokenCreateData, type ApiTokenRevokeData, type ApiTokenScope } from "./schema";
import { transact } from "../transaction";

/** Every token starts with this, so a leaked one is easy to recognise in logs and scanners. */
export const TOKEN_PREFIX = "tdm_";
const TOKEN_PATTERN = /^tdm_[A-Za-z0-9_-]{43}$/;

/** The stored form of a token: its SHA-256, hex. The token itself is never stored. */
export function hashApiToken(token: string): string {
  return createHash("sha256").update(token, "utf8").digest("hex");
}

/** The interface engine a request comes from, as services see it. */
export type TokenActor = {
  tokenId: number;
  name: string;
  scope: ApiTokenScope;
  unitIds: number[];
};

/**
 * Creates a token (admin only): 32 random bytes, base64url, shown once in the
 * answer; only its hash, a short prefix for the admin's list, the scope and
 * the expiry are kept. The ledger names it by id and name only: the ledger
 * cannot be purged, so no part of the secret goes there.
 */
export async function createApiToken(
  knex: Knex,
  actor: Actor,
  input: ApiTokenCreateData,
  now: Date = new Date(),
): Promise<{ token: string; summary: ApiTokenSummary }> {
  await confirmAdminPassword(knex, actor.id, input.currentPassword);
  const token = `${TOKEN_PREFIX}${randomBytes(32).toString("base64url")}`;
  const unitIds = [...new Set(input.unitIds)];
  const summary = await transact(knex, async (trx) => {
    const found = (await trx("units")
      .whereIn("id", unitIds)
      .where({ active: true })
      .select("id")) as { id: number }[];
    if (found.length !== unitIds.length) {
      throw new ValidationError("Some fields need attention.", {
        unitIds: ["One or more units do not exist or are inactive."],
      });
    }
    const [id] = await trx("api_tokens").insert({
      name: input.name,
      token_hash: hashApiToken(token),
      prefix: token.slice(0, 12),
      scope: input.scope,
      created_by: actor.id,
      created_at: now,
      expires_at: new Date(now.getTime() + input.validDays * 86_400_000),
    });
    const tokenId = Number(id);
    await trx("api_token_units").insert(
      unitIds.map((unitId) => ({ api_token_id: tokenId, unit_id: unitId })),
    );
    const created = (await getApiToken(trx, tokenId))!;
    await appendLedger(
      trx,
      actor,
      {
        action: "api_token.create",
        entityType: "api_token",
        entityId: tokenId,
        after: {
          name: created.name,
          scope: created.scope,
          unitIds,
          expiresAt: created.expiresAt,
        },
      },
      now,
    );
    return created;
  });
  return { token, summary };
}

/** Revokes a token at once (admin only); a revoked token is refused on its next request. */
export async function revokeApiToken(
  knex: Knex,
  actor: Actor,
  input: ApiTokenRevokeData,
  now: Date = new Date(),
): Promise<ApiTokenSummary> {
  await confirmAdminPassword(knex, actor.id, input.currentPassword);
  return transact(knex, async (trx) => {
    const row = (await trx("api_tokens")
      .where({ id: input.id })
      .forUpdate()
      .first("id", "revoked_at")) as { id: number; revoked_at: Date | null } | undefined;
    if (!row) throw new NotFoundError("That API token does not exist.");
    if (row.revoked_at) throw new ConflictError("That API token is already revoked.");
    await trx("api_tokens")
      .where({ id: input.id })
      .update({ revoked_at: now, revoked_by: actor.id });
    const after = (await getApiToken(trx, input.id))!;
    await appendLedger(
      trx,
      actor,
      {
        action: "api_token.revoke",
        entityType: "api_token",
        entityId: input.id,
        before: { revokedAt: null },
        after: { name: after.name, revokedAt: after.revokedAt },
        rationale: input.rationale,
      },
      now,
    );
    return after;
  });
}

/**
 * Authenticates `Authorization: Bearer tdm_…` for the import API. No or a
 * malformed header, an unknown, revoked or expired token: 401. A read token on
 * a write endpoint: 403. Marks the token as used.
 */
export async function authenticateApiToken(
  knex: Knex,
  authorization: string | null,
  need: ApiTokenScope,
  now: Date = new Date(),
): Promise<TokenActor> {
  const match = /^Bearer\s+(\S+)$/i.exec(authorization?.trim() ?? "");
  if (!match) {
    throw new UnauthenticatedError("Send an API token as 'Authorization: Bearer tdm_…'.");
  }
  const token = match[1]!;
  if (!TOKEN_PATTERN.test(token)) {
    throw new UnauthenticatedError("This API token is not valid or has been revoked.");
  }
  const row = (await knex("api_tokens")
    .where({ token_hash: hashApiToken(token) })
    .first("id", "name", "scope", "revoked_at", "expires_at")) as
    | { id: number; name: string; scope: ApiTokenScope; revoked_at: Date | null; expires_at: Date }
    | undefined;
  if (!row || row.revoked_at)
    throw new UnauthenticatedError("This API token is not valid or has been revoked.");
  // Only the holder of the secret reaches this, so saying why helps them and tells no one else anything.
  if (row.expires_at.getTime() <= now.getTime()) {
    throw new UnauthenticatedError(
      "This API token has expired; an administrator can create a new one.",
    );
  }
  if (need === "write" && row.scope !== "write") {
    throw new ForbiddenError(
      "This API token may only read; imports need a token with the write scope.",
    );
  }
  const units = (await knex("api_token_units as t")
    .join("units as u", "u.id", "t.unit_id")
    .where({ "t.api_token_id": row.id, "u.active": true })
    .select("u.id")) as { id: number }[];
  if (units.length === 0) throw new ForbiddenError("This API token has no active unit.");
  await knex("api_tokens").where({ id: row.id }).update({ last_used_at: now });
  return { tokenId: row.id, name: row.name, scope: row.scope, unitIds: units.map((u) => u.id) };
}

/** The unit a token request names (by code), refused with 403 when the token does not cover it. */
export async function tokenUnit(
  knex: Knex,
  token: TokenActor,
  unitCode: string | null,
): Promise<number> {
  if (!unitCode) {
    if (token.unitIds.length === 1) return token.unitIds[0]!;
    throw new ValidationError("Name the unit: this token covers more than one unit.", {
      unit: ["Give the unit code (?unit=…) when the token covers more than one unit."],
    });
  }
  const unit = (await knex("units").where({ code: unitCode, active: true }).first("id")) as
    { id: number } | undefined;
  if (!unit || !token.unitIds.includes(unit.id)) {
    throw new DomainError(`This API token is not allowed on unit ${unitCode.slice(0, 16)}.`, 403);
  }
  return unit.id;
}

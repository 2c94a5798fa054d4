import type { Knex } from "knex";
import type { ApiTokenScope } from "./schema";

export type ApiTokenSummary = {
  id: number;
  name: string;
  /** The first characters of the token, to tell tokens apart: "tdm_AbCdEfGh". */
  prefix: string;
  scope: ApiTokenScope;
  units: { id: number; code: string }[];
  createdBy: string;
  createdAt: string;
  /** After this moment the token is refused (401), like a revoked one. */
  expiresAt: string;
  /** Expired when the list was read. */
  expired: boolean;
  revokedAt: string | null;
  revokedBy: string | null;
  lastUsedAt: string | null;
};

type Row = {
  id: number;
  name: string;
  prefix: string;
  scope: ApiTokenScope;
  created_at: Date;
  expires_at: Date;
  revoked_at: Date | null;
  last_used_at: Date | null;
  created_by_name: string;
  revoked_by_name: string | null;
};

async function summaries(
  knex: Knex | Knex.Transaction,
  ids?: number[],
): Promise<ApiTokenSummary[]> {
  const q = knex("api_tokens as t")
    .join("users as c", "c.id", "t.created_by")
    .leftJoin("users as r", "r.id", "t.revoked_by")
    .orderBy([
      { column: "t.revoked_at", order: "asc", nulls: "first" },
      { column: "t.created_at", order: "desc" },
    ])
    .select(
      "t.id",
      "t.name",
      "t.prefix",
      "t.scope",
      "t.created_at",
      "t.expires_at",
      "t.revoked_at",
      "t.last_used_at",
      "c.name as created_by_name",
      "r.name as revoked_by_name",
    );
  if (ids) q.whereIn("t.id", ids);
  const rows = (await q) as Row[];
  const now = Date.now();
  const units = (await knex("api_token_units as tu")
    .join("units as u", "u.id", "tu.unit_id")
    .whereIn(
      "tu.api_token_id",
      rows.map((r) => r.id),
    )
    .orderBy("u.code")
    .select("tu.api_token_id", "u.id", "u.code")) as {
    api_token_id: number;
    id: number;
    code: string;
  }[];
  return rows.map((r) => ({
    id: r.id,
    name: r.name,
    prefix: r.prefix,
    scope: r.scope,
    units: units.filter((u) => u.api_token_id === r.id).map((u) => ({ id: u.id, code: u.code })),
    createdBy: r.created_by_name,
    createdAt: r.created_at.toISOString(),
    expiresAt: r.expires_at.toISOString(),
    expired: r.expires_at.getTime() <= now,
    revokedAt: r.revoked_at?.toISOString() ?? null,
    revokedBy: r.revoked_by_name,
    lastUsedAt: r.last_used_at?.toISOString() ?? null,
  }));
}

/** Every token, active first; never the secret, which is not stored. */
export function listApiTokens(knex: Knex): Promise<ApiTokenSummary[]> {
  return summaries(knex);
}

export async function getApiToken(
  knex: Knex | Knex.Transaction,
  id: number,
): Promise<ApiTokenSummary | undefined> {
  return (await summaries(knex, [id]))[0];
}

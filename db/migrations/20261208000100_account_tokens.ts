import type { Knex } from "knex";

// Account e-mails: invitation and password-reset links. Only a SHA-256 of each
// link's secret is kept (like API tokens); a link works once, until it expires
// or a newer one of the same kind voids it. `refused_at` marks the first
// refusal of an expired link, so it is recorded once in the ledger.
export async function up(knex: Knex): Promise<void> {
  if (await knex.schema.hasTable("account_tokens")) return;
  await knex.schema.createTable("account_tokens", (t) => {
    t.increments("id").primary();
    t.integer("user_id").unsigned().notNullable().references("users.id").onDelete("CASCADE");
    t.enum("kind", ["invite", "reset"]).notNullable();
    t.string("token_hash", 64).notNullable().unique("account_tokens_token_hash_unique");
    t.integer("created_by").unsigned().nullable().references("users.id");
    t.datetime("created_at", { precision: 3 }).notNullable();
    t.datetime("expires_at", { precision: 3 }).notNullable();
    t.datetime("used_at", { precision: 3 }).nullable();
    t.datetime("voided_at", { precision: 3 }).nullable();
    t.datetime("refused_at", { precision: 3 }).nullable();
    t.index(["user_id", "kind", "created_at"], "account_tokens_user_kind_index");
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTableIfExists("account_tokens");
}

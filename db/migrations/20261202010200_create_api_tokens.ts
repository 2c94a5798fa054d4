import type { Knex } from "knex";

export async function up(knex: Knex): Promise<void> {
  // Tokens for interface engines: only the SHA-256 of the secret is stored; the
  // secret itself is shown once, at creation.
  await knex.schema.createTable("api_tokens", (t) => {
    t.increments("id").primary();
    t.string("name", 120).notNullable();
    t.specificType("token_hash", "CHAR(64)")
      .notNullable()
      .unique({ indexName: "api_tokens_token_hash_unique" });
    // The first characters of the secret, so a person can tell tokens apart.
    t.string("prefix", 16).notNullable();
    t.enum("scope", ["read", "write"]).notNullable();
    t.integer("created_by").unsigned().notNullable().references("users.id");
    t.datetime("created_at", { precision: 3 }).notNullable().defaultTo(knex.fn.now(3));
    t.datetime("revoked_at", { precision: 3 }).nullable();
    t.integer("revoked_by").unsigned().nullable().references("users.id");
    t.datetime("last_used_at", { precision: 3 }).nullable();
  });
  await knex.schema.createTable("api_token_units", (t) => {
    t.integer("api_token_id").unsigned().notNullable().references("api_tokens.id");
    t.integer("unit_id").unsigned().notNullable().references("units.id");
    t.primary(["api_token_id", "unit_id"]);
  });
  await knex.schema.alterTable("imports", (t) => {
    t.foreign("api_token_id", "imports_api_token_id_foreign").references("api_tokens.id");
  });
}

export async function down(knex: Knex): Promise<void> {
  if (await knex.schema.hasTable("imports")) {
    await knex.schema.alterTable("imports", (t) => {
      t.dropForeign(["api_token_id"], "imports_api_token_id_foreign");
    });
  }
  await knex.schema.dropTableIfExists("api_token_units");
  await knex.schema.dropTableIfExists("api_tokens");
}

import type { Knex } from "knex";

// Every API token expires. MariaDB commits each ALTER on its own, so each step
// is safe to run again.

export async function up(knex: Knex): Promise<void> {
  if (!(await knex.schema.hasColumn("api_tokens", "expires_at"))) {
    await knex.schema.alterTable("api_tokens", (t) => {
      t.datetime("expires_at", { precision: 3 }).nullable();
    });
  }
  // Tokens made before expiry existed get the default year, but at least 30
  // days from now, so the migration itself cuts no interface engine off.
  await knex.raw(
    "UPDATE api_tokens SET expires_at = GREATEST(created_at + INTERVAL 1 YEAR, NOW(3) + INTERVAL 30 DAY) WHERE expires_at IS NULL",
  );
  await knex.raw("ALTER TABLE api_tokens MODIFY expires_at DATETIME(3) NOT NULL");
}

export async function down(knex: Knex): Promise<void> {
  if (await knex.schema.hasColumn("api_tokens", "expires_at")) {
    await knex.schema.alterTable("api_tokens", (t) => {
      t.dropColumn("expires_at");
    });
  }
}

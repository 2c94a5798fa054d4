import type { Knex } from "knex";

// An invited user has no password until they set one (a NULL hash never
// matches); a password an administrator set must be changed at first sign-in.
// MariaDB commits each ALTER on its own, so each step is safe to run again.
export async function up(knex: Knex): Promise<void> {
  await knex.raw("ALTER TABLE users MODIFY password_hash VARCHAR(100) NULL");
  if (!(await knex.schema.hasColumn("users", "password_change_required"))) {
    await knex.schema.alterTable("users", (t) => {
      t.boolean("password_change_required").notNullable().defaultTo(false);
    });
  }
}

export async function down(knex: Knex): Promise<void> {
  if (await knex.schema.hasColumn("users", "password_change_required")) {
    await knex.schema.alterTable("users", (t) => {
      t.dropColumn("password_change_required");
    });
  }
  await knex.raw("UPDATE users SET password_hash = '!' WHERE password_hash IS NULL");
  await knex.raw("ALTER TABLE users MODIFY password_hash VARCHAR(100) NOT NULL");
}

import type { Knex } from "knex";

export async function up(knex: Knex): Promise<void> {
  // Throttles sign-in per e-mail address typed (known or not) and per client address.
  await knex.schema.createTable("sign_in_attempts", (t) => {
    t.bigIncrements("id").primary();
    t.string("email_key", 254).notNullable();
    t.string("client_ip", 64).notNullable();
    t.boolean("succeeded").notNullable();
    t.datetime("attempted_at", { precision: 3 }).notNullable();
    t.index(["email_key", "attempted_at"], "sign_in_attempts_email_key_attempted_at_index");
    t.index(["client_ip", "attempted_at"], "sign_in_attempts_client_ip_attempted_at_index");
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTableIfExists("sign_in_attempts");
}

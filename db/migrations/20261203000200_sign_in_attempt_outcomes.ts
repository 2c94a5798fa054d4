import type { Knex } from "knex";

// Every password check is recorded with its outcome and purpose (sign-in, or
// the password re-entered to sign and change accounts); throttling counts only
// wrong passwords. Earlier rows become "ok" or "wrong".
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable("sign_in_attempts", (t) => {
    t.string("outcome", 16).notNullable().defaultTo("wrong");
    t.string("purpose", 16).notNullable().defaultTo("sign_in");
  });
  await knex("sign_in_attempts").where({ succeeded: true }).update({ outcome: "ok" });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable("sign_in_attempts", (t) => {
    t.dropColumn("outcome");
    t.dropColumn("purpose");
  });
}

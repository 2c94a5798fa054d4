import type { Knex } from "knex";

// Sessions Tidemark can end: the signed cookie names a row here, and the guard
// refuses a session that was ended (sign-out, password reset, role or unit
// change, deactivation) or left idle too long.
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable("user_sessions", (t) => {
    t.string("id", 36).primary();
    t.integer("user_id").unsigned().notNullable().references("users.id");
    t.datetime("created_at", { precision: 3 }).notNullable();
    t.datetime("last_seen_at", { precision: 3 }).notNullable();
    t.datetime("ended_at", { precision: 3 }).nullable();
    t.string("end_reason", 32).nullable();
    t.index(["user_id", "ended_at"], "user_sessions_user_id_ended_at_index");
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTableIfExists("user_sessions");
}

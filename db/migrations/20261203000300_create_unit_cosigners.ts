import type { Knex } from "knex";

// Physicians a unit designates to co-sign verbal and telephone orders that name
// another prescriber. A table of its own: editing a user rewrites their unit
// assignments (user_units), which would drop a flag kept there.

export async function up(knex: Knex): Promise<void> {
  if (await knex.schema.hasTable("unit_cosigners")) return;
  await knex.schema.createTable("unit_cosigners", (t) => {
    t.integer("unit_id").unsigned().notNullable().references("units.id");
    t.integer("user_id").unsigned().notNullable().references("users.id").onDelete("CASCADE");
    t.datetime("created_at", { precision: 3 }).notNullable().defaultTo(knex.fn.now(3));
    t.primary(["unit_id", "user_id"]);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTableIfExists("unit_cosigners");
}

import type { Knex } from "knex";

// The incoming nurse's acknowledgement of a bed's handoff: one per admission,
// shift start and nurse, so a second click changes nothing.

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable("handoff_acknowledgements", (t) => {
    t.increments("id").primary();
    t.integer("admission_id").unsigned().notNullable().references("admissions.id");
    t.integer("unit_id").unsigned().notNullable().references("units.id");
    t.datetime("shift_starts_at", { precision: 3 }).notNullable();
    t.integer("user_id").unsigned().notNullable().references("users.id");
    t.datetime("acknowledged_at", { precision: 3 }).notNullable();
    t.unique(["admission_id", "shift_starts_at", "user_id"], {
      indexName: "handoff_acknowledgements_once_unique",
    });
    t.index(["unit_id", "shift_starts_at"], "handoff_acknowledgements_unit_shift_index");
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTableIfExists("handoff_acknowledgements");
}

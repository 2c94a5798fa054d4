import type { Knex } from "knex";

// The Orders report's reassessments read an admission's manual readings
// only; this index keeps the 1 Hz monitor series out of that read.

export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable("readings", (t) => {
    t.index(["admission_id", "source", "taken_at"], "readings_manual_index");
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable("readings", (t) => {
    t.dropIndex(["admission_id", "source", "taken_at"], "readings_manual_index");
  });
}

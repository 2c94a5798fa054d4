import type { Knex } from "knex";

export async function up(knex: Knex): Promise<void> {
  // Which nurse or therapist looks after which bed during one shift.
  await knex.schema.createTable("care_assignments", (t) => {
    t.increments("id").primary();
    t.integer("bed_id").unsigned().notNullable().references("beds.id");
    t.integer("user_id").unsigned().notNullable().references("users.id");
    t.enum("duty", ["nurse", "therapist", "physician"]).notNullable();
    t.datetime("starts_at", { precision: 3 }).notNullable();
    t.datetime("ends_at", { precision: 3 }).notNullable();
    t.index(["bed_id", "starts_at", "ends_at"], "care_assignments_bed_window_index");
    t.index(["user_id", "starts_at"], "care_assignments_user_id_starts_at_index");
    t.unique(["bed_id", "duty", "starts_at"], {
      indexName: "care_assignments_bed_duty_start_unique",
    });
  });
  await knex.raw(
    "ALTER TABLE care_assignments ADD CONSTRAINT care_assignments_window CHECK (ends_at > starts_at)",
  );
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTableIfExists("care_assignments");
}

import type { Knex } from "knex";

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable("patients", (t) => {
    t.increments("id").primary();
    t.string("mrn", 20).notNullable().unique("patients_mrn_unique");
    t.string("family_name", 80).notNullable();
    t.string("given_name", 80).notNullable();
    t.date("birth_date").notNullable();
    // Predicted body weight (ARDS Network) needs sex at birth and height.
    t.enum("sex", ["female", "male"]).notNullable();
    t.decimal("height_cm", 5, 1).nullable();
    t.datetime("created_at", { precision: 3 }).notNullable().defaultTo(knex.fn.now(3));
  });
  await knex.schema.createTable("admissions", (t) => {
    t.increments("id").primary();
    t.integer("patient_id").unsigned().notNullable().references("patients.id");
    t.integer("bed_id").unsigned().notNullable().references("beds.id");
    t.datetime("admitted_at", { precision: 3 }).notNullable();
    t.datetime("discharged_at", { precision: 3 }).nullable();
    t.index(["bed_id", "discharged_at"], "admissions_bed_id_discharged_at_index");
  });
  // At most one open admission per bed and per patient, enforced by the database:
  // the generated columns are NULL once discharged, and NULLs never collide.
  await knex.raw(`ALTER TABLE admissions
    ADD COLUMN open_bed_id INT UNSIGNED AS (IF(discharged_at IS NULL, bed_id, NULL)) PERSISTENT,
    ADD COLUMN open_patient_id INT UNSIGNED AS (IF(discharged_at IS NULL, patient_id, NULL)) PERSISTENT,
    ADD UNIQUE INDEX admissions_open_bed_id_unique (open_bed_id),
    ADD UNIQUE INDEX admissions_open_patient_id_unique (open_patient_id)`);
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTableIfExists("admissions");
  await knex.schema.dropTableIfExists("patients");
}

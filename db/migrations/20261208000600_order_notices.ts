import type { Knex } from "knex";

// A notice to a bed's assigned nurse and therapist that its order changed
// (new, superseding, discontinued), with the change in words, and when they
// read it. One per order, event and person: a retried write adds nothing.

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable("order_notices", (t) => {
    t.increments("id").primary();
    t.integer("order_id").unsigned().notNullable().references("orders.id");
    t.enum("event", ["new", "supersede", "discontinue"]).notNullable();
    t.integer("patient_id").unsigned().notNullable().references("patients.id");
    t.integer("admission_id").unsigned().notNullable().references("admissions.id");
    t.integer("unit_id").unsigned().notNullable().references("units.id");
    t.integer("bed_id").unsigned().notNullable().references("beds.id");
    t.integer("user_id").unsigned().notNullable().references("users.id");
    t.enum("duty", ["nurse", "therapist"]).notNullable();
    t.text("words").notNullable();
    t.boolean("mailed").notNullable();
    t.datetime("created_at", { precision: 3 }).notNullable();
    t.datetime("read_at", { precision: 3 }).nullable();
    t.unique(["order_id", "event", "user_id"], { indexName: "order_notices_once_unique" });
    t.index(["user_id", "read_at"], "order_notices_user_id_read_at_index");
    t.index(["admission_id", "order_id"], "order_notices_admission_order_index");
  });
  // The notices' own e-mail choice, beside the alert kinds'.
  await knex.raw(`ALTER TABLE alert_email_preferences MODIFY kind ENUM('below_band', 'above_band',
    'limits_exhausted', 'reassessment_overdue', 'signal_loss', 'pao2_above_band', 'order_change') NOT NULL`);
}

export async function down(knex: Knex): Promise<void> {
  await knex("alert_email_preferences").where({ kind: "order_change" }).delete();
  await knex.raw(`ALTER TABLE alert_email_preferences MODIFY kind ENUM('below_band', 'above_band',
    'limits_exhausted', 'reassessment_overdue', 'signal_loss', 'pao2_above_band') NOT NULL`);
  await knex.schema.dropTableIfExists("order_notices");
}

import type { Knex } from "knex";

// A new alert kind: a ventilator check beyond the order's lung-protective
// limits (VT/kg, plateau pressure, driving pressure). Each ALTER commits on
// its own and is safe to run again.

const KINDS_BEFORE = [
  "below_band",
  "above_band",
  "limits_exhausted",
  "reassessment_overdue",
  "signal_loss",
  "pao2_above_band",
];
const KINDS_AFTER = [...KINDS_BEFORE, "lung_protection"];
// The e-mail choices also hold "order_change" (order notices, an earlier migration).
const PREFERENCES_BEFORE = [...KINDS_BEFORE, "order_change"];
const PREFERENCES_AFTER = [...PREFERENCES_BEFORE, "lung_protection"];

const enumOf = (values: readonly string[]) => `ENUM(${values.map((v) => `'${v}'`).join(", ")})`;

export async function up(knex: Knex): Promise<void> {
  await knex.raw(`ALTER TABLE alerts MODIFY kind ${enumOf(KINDS_AFTER)} NOT NULL`);
  await knex.raw(
    `ALTER TABLE alert_email_preferences MODIFY kind ${enumOf(PREFERENCES_AFTER)} NOT NULL`,
  );
}

export async function down(knex: Knex): Promise<void> {
  await knex("alert_email_preferences").where({ kind: "lung_protection" }).delete();
  await knex.raw(
    `ALTER TABLE alert_email_preferences MODIFY kind ${enumOf(PREFERENCES_BEFORE)} NOT NULL`,
  );
  await knex.raw(`ALTER TABLE alerts MODIFY kind ${enumOf(KINDS_BEFORE)} NOT NULL`);
}

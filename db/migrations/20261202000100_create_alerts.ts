import type { Knex } from "knex";

export const ALERT_KINDS = [
  "below_band",
  "above_band",
  "limits_exhausted",
  "reassessment_overdue",
] as const;

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable("alerts", (t) => {
    t.increments("id").primary();
    t.integer("patient_id").unsigned().notNullable().references("patients.id");
    t.integer("admission_id").unsigned().notNullable().references("admissions.id");
    t.integer("unit_id").unsigned().notNullable().references("units.id");
    t.integer("bed_id").unsigned().notNullable().references("beds.id");
    t.integer("order_id").unsigned().nullable().references("orders.id");
    t.enum("kind", [...ALERT_KINDS]).notNullable();
    t.enum("grade", ["routine", "urgent"]).notNullable();
    t.enum("state", ["opened", "notified", "acknowledged", "escalated", "resolved"]).notNullable();
    // 0: the assigned nurse, 1: the assigned therapist, 2: the responsible physician.
    t.tinyint("escalation_level").unsigned().notNullable().defaultTo(0);
    // When the condition began (first out-of-band reading, or the time it fell due).
    t.datetime("started_at", { precision: 3 }).notNullable();
    t.datetime("opened_at", { precision: 3 }).notNullable();
    t.tinyint("band_lower_pct").unsigned().nullable();
    t.tinyint("band_upper_pct").unsigned().nullable();
    t.decimal("trigger_spo2_pct", 4, 1).nullable();
    t.decimal("worst_spo2_pct", 4, 1).nullable();
    t.text("detail_json", "longtext").notNullable();
    t.datetime("notified_at", { precision: 3 }).nullable();
    t.datetime("escalated_at", { precision: 3 }).nullable();
    t.datetime("next_escalation_at", { precision: 3 }).nullable();
    t.datetime("acknowledged_at", { precision: 3 }).nullable();
    t.integer("acknowledged_by").unsigned().nullable().references("users.id");
    t.text("acknowledge_note").nullable();
    t.datetime("resolved_at", { precision: 3 }).nullable();
    // Null with a resolved_at: resolved by detection (back in band, reassessed).
    t.integer("resolved_by").unsigned().nullable().references("users.id");
    t.text("resolve_reason").nullable();
    t.integer("version").unsigned().notNullable().defaultTo(1);
    t.index(["unit_id", "state"], "alerts_unit_id_state_index");
    t.index(["patient_id", "opened_at"], "alerts_patient_id_opened_at_index");
    t.index(["state", "next_escalation_at"], "alerts_state_next_escalation_index");
  });
  // At most one unresolved alert of each kind per admission, enforced by the database.
  await knex.raw(`ALTER TABLE alerts
    ADD COLUMN open_admission_id INT UNSIGNED AS (IF(state <> 'resolved', admission_id, NULL)) PERSISTENT,
    ADD UNIQUE INDEX alerts_open_admission_kind_unique (open_admission_id, kind)`);

  // Where excursion detection stands per admission, so each write continues
  // from the last one instead of re-reading the series.
  await knex.schema.createTable("alert_watches", (t) => {
    t.integer("admission_id").unsigned().primary().references("admissions.id");
    t.text("state_json").notNullable();
    t.datetime("updated_at", { precision: 3 }).notNullable();
  });

  // E-mail written in the same transaction as the alert step it announces; a
  // worker delivers it. Sent state is recorded only after the relay accepts.
  await knex.schema.createTable("mail_outbox", (t) => {
    t.bigIncrements("id").primary();
    t.integer("alert_id").unsigned().nullable().references("alerts.id");
    t.string("purpose", 24).notNullable();
    t.integer("recipient_user_id").unsigned().notNullable().references("users.id");
    t.string("to_address", 254).notNullable();
    t.string("subject", 200).notNullable();
    t.text("text_body").notNullable();
    t.text("html_body", "mediumtext").notNullable();
    // Stable across retries, so a relay or reader can drop a duplicate.
    t.string("message_id", 200).notNullable().unique("mail_outbox_message_id_unique");
    t.enum("state", ["pending", "sent"]).notNullable().defaultTo("pending");
    t.integer("attempts").unsigned().notNullable().defaultTo(0);
    t.datetime("next_attempt_at", { precision: 3 }).notNullable();
    t.datetime("claimed_until", { precision: 3 }).nullable();
    t.text("last_error").nullable();
    t.string("relay_response", 300).nullable();
    t.datetime("created_at", { precision: 3 }).notNullable();
    t.datetime("sent_at", { precision: 3 }).nullable();
    t.unique(["alert_id", "purpose", "recipient_user_id"], {
      indexName: "mail_outbox_alert_purpose_recipient_unique",
    });
    t.index(["state", "next_attempt_at"], "mail_outbox_state_next_attempt_index");
  });

  // Per-user e-mail choices per alert kind; no row means "e-mail me".
  await knex.schema.createTable("alert_email_preferences", (t) => {
    t.integer("user_id").unsigned().notNullable().references("users.id");
    t.enum("kind", [...ALERT_KINDS]).notNullable();
    t.boolean("email").notNullable();
    t.datetime("updated_at", { precision: 3 }).notNullable();
    t.primary(["user_id", "kind"]);
  });
}

export async function down(knex: Knex): Promise<void> {
  for (const table of ["alert_email_preferences", "mail_outbox", "alert_watches", "alerts"]) {
    await knex.schema.dropTableIfExists(table);
  }
}

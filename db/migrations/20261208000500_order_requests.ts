import type { Knex } from "knex";

// A bedside clinician's request for a new order, addressed to the shift's
// responsible physician (or the order's prescriber), open until a new order is
// signed for the patient or the physician replies with a reason.

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable("order_requests", (t) => {
    t.increments("id").primary();
    t.integer("patient_id").unsigned().notNullable().references("patients.id");
    t.integer("admission_id").unsigned().notNullable().references("admissions.id");
    t.integer("unit_id").unsigned().notNullable().references("units.id");
    t.integer("bed_id").unsigned().notNullable().references("beds.id");
    // The order in effect when it was asked (none: the patient had no order).
    t.integer("order_id").unsigned().nullable().references("orders.id");
    t.integer("alert_id").unsigned().nullable().references("alerts.id");
    t.enum("source", ["limit_refusal", "limits_alert", "chart"]).notNullable();
    t.integer("requested_by").unsigned().notNullable().references("users.id");
    // Null when nobody but the unit's fallback address could be told.
    t.integer("physician_id").unsigned().nullable().references("users.id");
    t.enum("recipient_basis", ["assigned", "prescriber", "charge", "fallback"]).nullable();
    t.text("need").notNullable();
    t.text("reason").notNullable();
    // What the composer is prefilled with: device and limits the requester proposes.
    t.string("device", 32).nullable();
    t.decimal("fio2_max", 4, 2).nullable();
    t.decimal("peep_max_cmh2o", 4, 1).nullable();
    t.decimal("flow_max_l_min", 5, 1).nullable();
    // The settings in use and the latest SpO2 at the moment of asking.
    t.text("snapshot_json").notNullable();
    t.enum("state", ["open", "escalated", "closed"]).notNullable().defaultTo("open");
    t.tinyint("escalation_level").unsigned().notNullable().defaultTo(0);
    t.datetime("next_escalation_at", { precision: 3 }).nullable();
    t.datetime("escalated_at", { precision: 3 }).nullable();
    t.text("told_json").notNullable();
    t.datetime("created_at", { precision: 3 }).notNullable();
    t.datetime("closed_at", { precision: 3 }).nullable();
    t.integer("closed_by").unsigned().nullable().references("users.id");
    t.enum("closed_how", ["order", "reply"]).nullable();
    t.integer("closed_order_id").unsigned().nullable().references("orders.id");
    t.text("reply").nullable();
    t.integer("version").unsigned().notNullable().defaultTo(1);
    t.index(["unit_id", "state"], "order_requests_unit_id_state_index");
    t.index(["state", "next_escalation_at"], "order_requests_state_next_escalation_index");
    t.index(["physician_id", "state"], "order_requests_physician_id_state_index");
    t.index(["requested_by", "created_at"], "order_requests_requested_by_index");
  });
  // One open request per admission: a second ask joins the first instead of piling up.
  await knex.raw(`ALTER TABLE order_requests
    ADD COLUMN open_admission_id INT UNSIGNED AS (IF(state <> 'closed', admission_id, NULL)) PERSISTENT,
    ADD UNIQUE INDEX order_requests_open_admission_id_unique (open_admission_id)`);
  await knex.schema.alterTable("mail_outbox", (t) => {
    t.integer("order_request_id").unsigned().nullable().references("order_requests.id");
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable("mail_outbox", (t) => {
    t.dropForeign(["order_request_id"]);
    t.dropColumn("order_request_id");
  });
  await knex.schema.dropTableIfExists("order_requests");
}

import type { Knex } from "knex";
import { DEVICES } from "./20261201010200_create_orders";

export async function up(knex: Knex): Promise<void> {
  // What is applied at the bedside now, one row per admission. Its version is
  // the concurrency guard: an adjustment names the version it started from.
  await knex.schema.createTable("bedside_settings", (t) => {
    t.integer("admission_id").unsigned().primary().references("admissions.id");
    t.integer("patient_id").unsigned().notNullable().references("patients.id");
    t.enum("device", [...DEVICES]).notNullable();
    t.decimal("fio2", 3, 2).notNullable();
    t.boolean("fio2_estimated").notNullable().defaultTo(false);
    t.decimal("peep_cmh2o", 4, 1).nullable();
    t.decimal("flow_l_min", 4, 1).nullable();
    t.integer("version").unsigned().notNullable().defaultTo(1);
    t.datetime("updated_at", { precision: 3 }).notNullable();
    t.datetime("last_reassessed_at", { precision: 3 }).notNullable();
  });

  await knex.schema.createTable("adjustments", (t) => {
    t.increments("id").primary();
    t.integer("patient_id").unsigned().notNullable().references("patients.id");
    t.integer("admission_id").unsigned().notNullable().references("admissions.id");
    t.integer("order_id").unsigned().notNullable().references("orders.id");
    t.enum("device", [...DEVICES]).notNullable();
    t.decimal("from_fio2", 3, 2).notNullable();
    t.decimal("to_fio2", 3, 2).notNullable();
    t.decimal("from_peep_cmh2o", 4, 1).nullable();
    t.decimal("to_peep_cmh2o", 4, 1).nullable();
    t.decimal("from_flow_l_min", 4, 1).nullable();
    t.decimal("to_flow_l_min", 4, 1).nullable();
    t.string("reason", 40).notNullable();
    t.text("rationale").notNullable();
    t.datetime("applied_at", { precision: 3 }).notNullable();
    t.integer("recorded_by").unsigned().notNullable().references("users.id");
    // The forecast the clinician saw, kept with the change it informed.
    t.text("forecast_json", "longtext").nullable();
    t.string("engine_version", 20).notNullable();
    t.datetime("created_at", { precision: 3 }).notNullable().defaultTo(knex.fn.now(3));
    t.index(["patient_id", "applied_at"], "adjustments_patient_id_applied_at_index");
  });

  await knex.schema.createTable("readings", (t) => {
    t.bigIncrements("id").primary();
    t.integer("patient_id").unsigned().notNullable().references("patients.id");
    t.integer("admission_id").unsigned().notNullable().references("admissions.id");
    t.datetime("taken_at", { precision: 3 }).notNullable();
    t.decimal("spo2_pct", 4, 1).notNullable();
    t.smallint("respiratory_rate_per_min").unsigned().nullable();
    t.smallint("pulse_rate_per_min").unsigned().nullable();
    t.enum("device", [...DEVICES]).notNullable();
    t.decimal("flow_l_min", 4, 1).nullable();
    t.decimal("fio2", 3, 2).notNullable();
    // Low-flow devices deliver a variable FiO2: the value is an estimate.
    t.boolean("fio2_estimated").notNullable().defaultTo(false);
    t.enum("source", ["manual", "monitor"]).notNullable();
    t.integer("recorded_by").unsigned().nullable().references("users.id");
    t.datetime("created_at", { precision: 3 }).notNullable().defaultTo(knex.fn.now(3));
    t.index(["patient_id", "taken_at"], "readings_patient_id_taken_at_index");
  });

  await knex.schema.createTable("blood_gases", (t) => {
    t.increments("id").primary();
    t.integer("patient_id").unsigned().notNullable().references("patients.id");
    t.integer("admission_id").unsigned().notNullable().references("admissions.id");
    t.datetime("sampled_at", { precision: 3 }).notNullable();
    t.enum("sample_type", ["arterial", "venous"]).notNullable();
    t.decimal("ph", 4, 2).nullable();
    t.decimal("pao2_mmhg", 5, 1).notNullable();
    t.decimal("paco2_mmhg", 5, 1).notNullable();
    t.decimal("hco3_mmol_l", 4, 1).nullable();
    t.decimal("base_excess_mmol_l", 4, 1).nullable();
    t.decimal("sao2_pct", 4, 1).nullable();
    t.decimal("hb_g_dl", 4, 1).nullable();
    t.enum("device", [...DEVICES]).notNullable();
    t.decimal("fio2", 3, 2).notNullable();
    t.boolean("fio2_estimated").notNullable().defaultTo(false);
    t.decimal("peep_cmh2o", 4, 1).nullable();
    t.decimal("barometric_pressure_mmhg", 5, 1).notNullable();
    // Indices computed on save, with the engine version that computed them.
    t.decimal("pf_ratio", 6, 1).nullable();
    t.decimal("aa_gradient_mmhg", 5, 1).nullable();
    t.decimal("cao2_ml_dl", 4, 1).nullable();
    t.text("indices_json", "longtext").notNullable();
    t.string("engine_version", 20).notNullable();
    t.integer("recorded_by").unsigned().notNullable().references("users.id");
    t.datetime("created_at", { precision: 3 }).notNullable().defaultTo(knex.fn.now(3));
    t.index(["patient_id", "sampled_at"], "blood_gases_patient_id_sampled_at_index");
  });

  // A repeated submission (double click, retry) returns the first result.
  await knex.schema.createTable("idempotency_keys", (t) => {
    t.integer("user_id").unsigned().notNullable().references("users.id");
    t.string("idem_key", 64).notNullable();
    t.string("operation", 40).notNullable();
    t.text("response_json", "longtext").notNullable();
    t.datetime("created_at", { precision: 3 }).notNullable().defaultTo(knex.fn.now(3));
    t.primary(["user_id", "idem_key"]);
  });
}

export async function down(knex: Knex): Promise<void> {
  for (const table of [
    "idempotency_keys",
    "blood_gases",
    "readings",
    "adjustments",
    "bedside_settings",
  ]) {
    await knex.schema.dropTableIfExists(table);
  }
}

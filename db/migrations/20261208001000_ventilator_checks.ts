import type { Knex } from "knex";

// One ventilator check: what the therapist or physician read off the
// ventilator, the PaCO2 of the latest gas, and what Tidemark computed from
// them (with the basis of each number in indices_json and the engine version).

export async function up(knex: Knex): Promise<void> {
  if (await knex.schema.hasTable("ventilator_checks")) return;
  await knex.schema.createTable("ventilator_checks", (t) => {
    t.increments("id").primary();
    t.integer("patient_id").unsigned().notNullable().references("patients.id");
    t.integer("admission_id").unsigned().notNullable().references("admissions.id");
    t.integer("order_id").unsigned().notNullable().references("orders.id");
    t.datetime("checked_at", { precision: 3 }).notNullable();
    t.enum("vent_mode", [
      "volume_control",
      "pressure_control",
      "pressure_support",
      "cpap",
    ]).notNullable();
    t.smallint("set_vt_ml").unsigned().nullable();
    t.smallint("measured_vt_ml").unsigned().notNullable();
    t.tinyint("set_rate_per_min").unsigned().nullable();
    t.tinyint("measured_rate_per_min").unsigned().notNullable();
    t.decimal("minute_ventilation_l_min", 4, 1).nullable();
    t.decimal("peak_cmh2o", 3, 1).nullable();
    t.decimal("plateau_cmh2o", 3, 1).nullable();
    t.decimal("total_peep_cmh2o", 3, 1).notNullable();
    t.decimal("paco2_mmhg", 4, 1).nullable();
    t.integer("paco2_blood_gas_id").unsigned().nullable().references("blood_gases.id");
    t.decimal("pbw_kg", 4, 1).notNullable();
    t.decimal("vt_per_kg", 4, 2).notNullable();
    t.decimal("driving_pressure_cmh2o", 3, 1).nullable();
    t.decimal("compliance_ml_cmh2o", 6, 1).nullable();
    t.decimal("mechanical_power_j_min", 5, 1).nullable();
    t.decimal("ventilatory_ratio", 4, 2).nullable();
    // The order's limits the check was held against, and the ones it was beyond.
    t.text("limits_json").notNullable();
    t.text("breaches_json").notNullable();
    t.text("indices_json", "longtext").notNullable();
    t.string("engine_version", 20).notNullable();
    t.integer("recorded_by").unsigned().notNullable().references("users.id");
    t.datetime("created_at", { precision: 3 }).notNullable();
    t.index(["admission_id", "checked_at"], "ventilator_checks_admission_checked_index");
    t.index(["patient_id", "checked_at"], "ventilator_checks_patient_checked_index");
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTableIfExists("ventilator_checks");
}

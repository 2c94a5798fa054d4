import type { Knex } from "knex";

export const DEVICES = [
  "room_air",
  "nasal_cannula",
  "simple_mask",
  "venturi_mask",
  "reservoir_mask",
  "hfnc",
  "niv",
  "invasive",
] as const;

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable("orders", (t) => {
    t.increments("id").primary();
    t.integer("patient_id").unsigned().notNullable().references("patients.id");
    t.integer("admission_id").unsigned().notNullable().references("admissions.id");
    t.integer("unit_id").unsigned().notNullable().references("units.id");
    t.enum("status", [
      "draft",
      "awaiting_cosign",
      "active",
      "superseded",
      "discontinued",
    ]).notNullable();
    t.enum("device", [...DEVICES]).notNullable();
    t.tinyint("spo2_lower_pct").unsigned().notNullable();
    t.tinyint("spo2_upper_pct").unsigned().notNullable();
    t.decimal("pao2_lower_mmhg", 5, 1).nullable();
    t.decimal("pao2_upper_mmhg", 5, 1).nullable();
    t.decimal("fio2_min", 3, 2).notNullable();
    t.decimal("fio2_max", 3, 2).notNullable();
    t.decimal("peep_min_cmh2o", 4, 1).nullable();
    t.decimal("peep_max_cmh2o", 4, 1).nullable();
    t.decimal("flow_min_l_min", 4, 1).nullable();
    t.decimal("flow_max_l_min", 4, 1).nullable();
    t.decimal("initial_fio2", 3, 2).notNullable();
    t.decimal("initial_peep_cmh2o", 4, 1).nullable();
    t.decimal("initial_flow_l_min", 4, 1).nullable();
    t.integer("step_table_id").unsigned().nullable().references("step_tables.id");
    t.smallint("reassess_minutes").unsigned().notNullable();
    t.text("rationale").notNullable();
    t.enum("entry_mode", ["written", "verbal", "telephone"]).notNullable();
    t.boolean("read_back_confirmed").notNullable().defaultTo(false);
    t.integer("entered_by").unsigned().notNullable().references("users.id");
    t.integer("prescriber_id").unsigned().notNullable().references("users.id");
    t.integer("signed_by").unsigned().nullable().references("users.id");
    t.datetime("signed_at", { precision: 3 }).nullable();
    t.string("signature_meaning", 200).nullable();
    t.integer("cosigned_by").unsigned().nullable().references("users.id");
    t.datetime("cosigned_at", { precision: 3 }).nullable();
    t.integer("discontinued_by").unsigned().nullable().references("users.id");
    t.datetime("discontinued_at", { precision: 3 }).nullable();
    t.text("discontinue_reason").nullable();
    t.integer("superseded_by_order_id").unsigned().nullable();
    t.integer("version").unsigned().notNullable().defaultTo(1);
    t.datetime("created_at", { precision: 3 }).notNullable().defaultTo(knex.fn.now(3));
    t.datetime("updated_at", { precision: 3 }).notNullable().defaultTo(knex.fn.now(3));
    t.index(["patient_id", "status"], "orders_patient_id_status_index");
    t.index(["unit_id", "status"], "orders_unit_id_status_index");
  });
  await knex.raw(`ALTER TABLE orders
    ADD CONSTRAINT orders_spo2_band CHECK (spo2_lower_pct BETWEEN 70 AND 100 AND spo2_upper_pct BETWEEN 70 AND 100 AND spo2_lower_pct < spo2_upper_pct),
    ADD CONSTRAINT orders_fio2_limits CHECK (fio2_min >= 0.21 AND fio2_max <= 1.00 AND fio2_min <= fio2_max)`);
  // At most one order in effect per patient, enforced by the database.
  await knex.raw(`ALTER TABLE orders
    ADD COLUMN current_patient_id INT UNSIGNED AS (IF(status IN ('active', 'awaiting_cosign'), patient_id, NULL)) PERSISTENT,
    ADD UNIQUE INDEX orders_current_patient_id_unique (current_patient_id)`);
  // The order as it stood at any past time: FOR SYSTEM_TIME AS OF. Last,
  // because a versioned table refuses further ALTERs by default.
  await knex.raw("ALTER TABLE orders ADD SYSTEM VERSIONING");
}

export async function down(knex: Knex): Promise<void> {
  await knex.raw("ALTER TABLE orders DROP SYSTEM VERSIONING").catch(() => undefined);
  await knex.schema.dropTableIfExists("orders");
}

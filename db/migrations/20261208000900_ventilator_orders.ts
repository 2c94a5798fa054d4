import type { Knex } from "knex";

// The ventilator part of an order (invasive ventilation and NIV): mode, tidal
// volume target and range per kg of predicted body weight, rate range and the
// lung-protective pressure limits, with the predicted body weight the order
// was written against. NULL on every other device. `orders` is
// system-versioned: an ALTER must say that the history is kept as it is.

const MODES = ["volume_control", "pressure_control", "pressure_support", "cpap"];
const KEEP = "SET STATEMENT system_versioning_alter_history = KEEP FOR";

export async function up(knex: Knex): Promise<void> {
  if (await knex.schema.hasColumn("orders", "vent_mode")) return;
  await knex.raw(`${KEEP} ALTER TABLE orders
    ADD COLUMN vent_mode ENUM(${MODES.map((m) => `'${m}'`).join(", ")}) NULL,
    ADD COLUMN vt_target_ml_kg DECIMAL(3,1) NULL,
    ADD COLUMN vt_min_ml_kg DECIMAL(3,1) NULL,
    ADD COLUMN vt_max_ml_kg DECIMAL(3,1) NULL,
    ADD COLUMN rate_min_per_min TINYINT UNSIGNED NULL,
    ADD COLUMN rate_max_per_min TINYINT UNSIGNED NULL,
    ADD COLUMN plateau_limit_cmh2o DECIMAL(3,1) NULL,
    ADD COLUMN driving_limit_cmh2o DECIMAL(3,1) NULL,
    ADD COLUMN pbw_kg DECIMAL(4,1) NULL,
    ADD COLUMN pbw_height_cm DECIMAL(4,1) NULL,
    ADD CONSTRAINT orders_vent_targets CHECK (vent_mode IS NULL OR (
      vt_min_ml_kg <= vt_target_ml_kg AND vt_target_ml_kg <= vt_max_ml_kg
      AND rate_min_per_min <= rate_max_per_min
      AND plateau_limit_cmh2o IS NOT NULL AND driving_limit_cmh2o IS NOT NULL AND pbw_kg IS NOT NULL))`);
}

export async function down(knex: Knex): Promise<void> {
  if (!(await knex.schema.hasColumn("orders", "vent_mode"))) return;
  await knex.raw(`${KEEP} ALTER TABLE orders
    DROP CONSTRAINT orders_vent_targets,
    DROP COLUMN vent_mode, DROP COLUMN vt_target_ml_kg, DROP COLUMN vt_min_ml_kg,
    DROP COLUMN vt_max_ml_kg, DROP COLUMN rate_min_per_min, DROP COLUMN rate_max_per_min,
    DROP COLUMN plateau_limit_cmh2o, DROP COLUMN driving_limit_cmh2o, DROP COLUMN pbw_kg,
    DROP COLUMN pbw_height_cm`);
}

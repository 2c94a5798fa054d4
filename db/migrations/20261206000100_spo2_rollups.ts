import type { Knex } from "knex";

// Where each admission lay and when: a row per bed, so time can be counted
// per bed and unit after a transfer. Admissions recorded before this table
// existed get one stay in their current bed.
//
// Rollups of the SpO2 series and the applied FiO2, per admission and minute
// and per admission, half hour and bed, written in the same transaction as the
// readings, adjustments, orders and moves that change them (lib/rollups). A
// minute row exists only for a minute with something known; time nobody
// knew is the stay's time minus the known time. Half-hour rows are the sums
// of the minute rows, so a report over 30 days reads half hours and only the
// minutes at its edges (shift and day boundaries fall on the half hour in
// nearly every unit and time zone).

const MEASURES = (t: Knex.CreateTableBuilder) => {
  t.integer("patient_id").unsigned().notNullable();
  t.integer("unit_id").unsigned().notNullable();
  t.integer("below_ms").unsigned().notNullable().defaultTo(0);
  t.integer("in_band_ms").unsigned().notNullable().defaultTo(0);
  t.integer("above_ms").unsigned().notNullable().defaultTo(0);
  t.integer("below88_ms").unsigned().notNullable().defaultTo(0);
  t.integer("below85_ms").unsigned().notNullable().defaultTo(0);
  // ∫ (lower bound − SpO2) dt while below the band, in %·s.
  t.double("below_area_pct_s").notNullable().defaultTo(0);
  // The lowest SpO2 held during the bucket.
  t.decimal("min_spo2_pct", 4, 1).nullable();
  // Applied settings while an order is in effect and the SpO2 series known:
  // time on an FiO2 above 0.21, ∫ (FiO2 − 0.21) dt in FiO2·s, time at FiO2 ≥ 0.6.
  t.integer("o2_ms").unsigned().notNullable().defaultTo(0);
  t.double("fio2_excess_s").notNullable().defaultTo(0);
  t.integer("fio2_high_ms").unsigned().notNullable().defaultTo(0);
};

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable("admission_stays", (t) => {
    t.increments("id").primary();
    t.integer("admission_id").unsigned().notNullable().references("admissions.id");
    t.integer("patient_id").unsigned().notNullable().references("patients.id");
    t.integer("bed_id").unsigned().notNullable().references("beds.id");
    t.integer("unit_id").unsigned().notNullable().references("units.id");
    t.datetime("started_at", { precision: 3 }).notNullable();
    t.datetime("ended_at", { precision: 3 }).nullable();
    t.index(["admission_id", "started_at"], "admission_stays_admission_index");
    t.index(["unit_id", "started_at"], "admission_stays_unit_index");
  });
  await knex.raw(`INSERT INTO admission_stays (admission_id, patient_id, bed_id, unit_id, started_at, ended_at)
    SELECT a.id, a.patient_id, a.bed_id, b.unit_id, a.admitted_at, a.discharged_at
      FROM admissions a JOIN beds b ON b.id = a.bed_id`);

  await knex.schema.createTable("rollup_minutes", (t) => {
    t.integer("admission_id").unsigned().notNullable().references("admissions.id");
    t.datetime("minute_at").notNullable();
    t.integer("bed_id").unsigned().notNullable();
    MEASURES(t);
    t.primary(["admission_id", "minute_at"]);
    t.index(["unit_id", "minute_at"], "rollup_minutes_unit_index");
  });
  await knex.schema.createTable("rollup_slots", (t) => {
    t.integer("admission_id").unsigned().notNullable().references("admissions.id");
    t.datetime("slot_at").notNullable();
    t.integer("bed_id").unsigned().notNullable();
    MEASURES(t);
    t.primary(["admission_id", "slot_at", "bed_id"]);
    t.index(["unit_id", "slot_at"], "rollup_slots_unit_index");
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTableIfExists("rollup_slots");
  await knex.schema.dropTableIfExists("rollup_minutes");
  await knex.schema.dropTableIfExists("admission_stays");
}

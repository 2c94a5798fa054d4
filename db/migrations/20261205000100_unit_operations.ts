import type { Knex } from "knex";

// What a unit needs to run day after day: its shift pattern, the devices it
// allows, an address for alerts nobody else would receive; a charge nurse per
// shift; discharge dispositions; and e-mail to an address with no user behind
// it (the fallback), with the reason each recipient was chosen.

export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable("units", (t) => {
    // The first shift of the day starts at this wall time in the unit's zone.
    t.string("shift_start", 5).notNullable().defaultTo("07:00");
    t.tinyint("shift_hours").unsigned().notNullable().defaultTo(12);
    // JSON array of device codes; a unit allows only these.
    t.text("devices_json").nullable();
    t.string("fallback_email", 254).nullable();
    t.integer("version").unsigned().notNullable().defaultTo(1);
  });
  // Units that existed before allowed every device; written out, so the
  // setting is explicit from now on (the codes of lib/devices at this release).
  await knex("units").update({
    devices_json: JSON.stringify([
      "room_air",
      "nasal_cannula",
      "simple_mask",
      "venturi_mask",
      "reservoir_mask",
      "hfnc",
      "niv",
      "invasive",
    ]),
  });
  await knex.raw(
    "ALTER TABLE units ADD CONSTRAINT units_shift_hours CHECK (shift_hours IN (6, 8, 12, 24))",
  );
  await knex.raw(
    "ALTER TABLE units ADD CONSTRAINT units_shift_start CHECK (shift_start REGEXP '^([01][0-9]|2[0-3]):[0-5][0-9]$')",
  );

  await knex.schema.alterTable("patients", (t) => {
    t.decimal("weight_kg", 5, 1).nullable();
    t.integer("version").unsigned().notNullable().defaultTo(1);
  });

  await knex.schema.alterTable("admissions", (t) => {
    t.enum("discharge_disposition", ["home", "other_hospital", "death"]).nullable();
  });

  // The charge nurse of a unit for one shift; one per unit and shift start.
  await knex.schema.createTable("unit_charge_duties", (t) => {
    t.increments("id").primary();
    t.integer("unit_id").unsigned().notNullable().references("units.id");
    t.integer("user_id").unsigned().notNullable().references("users.id");
    t.datetime("starts_at", { precision: 3 }).notNullable();
    t.datetime("ends_at", { precision: 3 }).notNullable();
    t.unique(["unit_id", "starts_at"], { indexName: "unit_charge_duties_unit_start_unique" });
  });
  await knex.raw(
    "ALTER TABLE unit_charge_duties ADD CONSTRAINT unit_charge_duties_window CHECK (ends_at > starts_at)",
  );

  // The fallback address has no user; the basis says why each recipient got it.
  await knex.raw("ALTER TABLE mail_outbox MODIFY recipient_user_id INT UNSIGNED NULL");
  await knex.schema.alterTable("mail_outbox", (t) => {
    t.enum("recipient_basis", ["assigned", "prescriber", "charge", "fallback"]).nullable();
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable("mail_outbox", (t) => t.dropColumn("recipient_basis"));
  await knex("mail_outbox").whereNull("recipient_user_id").delete();
  await knex.raw("ALTER TABLE mail_outbox MODIFY recipient_user_id INT UNSIGNED NOT NULL");
  await knex.schema.dropTableIfExists("unit_charge_duties");
  await knex.schema.alterTable("admissions", (t) => t.dropColumn("discharge_disposition"));
  await knex.schema.alterTable("patients", (t) => {
    t.dropColumn("weight_kg");
    t.dropColumn("version");
  });
  await knex.raw("ALTER TABLE units DROP CONSTRAINT units_shift_hours");
  await knex.raw("ALTER TABLE units DROP CONSTRAINT units_shift_start");
  await knex.schema.alterTable("units", (t) => {
    t.dropColumn("shift_start");
    t.dropColumn("shift_hours");
    t.dropColumn("devices_json");
    t.dropColumn("fallback_email");
    t.dropColumn("version");
  });
}

import type { Knex } from "knex";

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable("units", (t) => {
    t.increments("id").primary();
    t.string("code", 16).notNullable().unique("units_code_unique");
    t.string("name", 120).notNullable();
    t.enum("kind", ["icu", "ward"]).notNullable();
    // Altitude sets the barometric pressure used by the alveolar gas equation.
    t.integer("altitude_m").notNullable().defaultTo(0);
    t.string("time_zone", 64).notNullable().defaultTo("UTC");
    t.boolean("active").notNullable().defaultTo(true);
    t.datetime("created_at", { precision: 3 }).notNullable().defaultTo(knex.fn.now(3));
  });
  await knex.raw(
    "ALTER TABLE units ADD CONSTRAINT units_altitude_m_range CHECK (altitude_m BETWEEN -500 AND 5500)",
  );
  await knex.schema.createTable("beds", (t) => {
    t.increments("id").primary();
    t.integer("unit_id").unsigned().notNullable().references("units.id");
    t.string("label", 16).notNullable();
    t.integer("sort_order").notNullable().defaultTo(0);
    t.boolean("active").notNullable().defaultTo(true);
    t.unique(["unit_id", "label"], { indexName: "beds_unit_id_label_unique" });
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTableIfExists("beds");
  await knex.schema.dropTableIfExists("units");
}

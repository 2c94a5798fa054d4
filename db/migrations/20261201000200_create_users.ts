import type { Knex } from "knex";

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable("users", (t) => {
    t.increments("id").primary();
    t.string("email", 254).notNullable().unique("users_email_unique");
    t.string("name", 120).notNullable();
    t.enum("role", ["physician", "therapist", "nurse", "reviewer", "admin"]).notNullable();
    t.string("password_hash", 100).notNullable();
    t.boolean("active").notNullable().defaultTo(true);
    t.enum("pressure_unit", ["mmHg", "kPa"]).notNullable().defaultTo("mmHg");
    // Optimistic concurrency: an edit names the version it started from.
    t.integer("version").unsigned().notNullable().defaultTo(1);
    t.datetime("created_at", { precision: 3 }).notNullable().defaultTo(knex.fn.now(3));
    t.datetime("updated_at", { precision: 3 }).notNullable().defaultTo(knex.fn.now(3));
  });
  await knex.schema.createTable("user_units", (t) => {
    t.integer("user_id").unsigned().notNullable().references("users.id").onDelete("CASCADE");
    t.integer("unit_id").unsigned().notNullable().references("units.id");
    t.primary(["user_id", "unit_id"]);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTableIfExists("user_units");
  await knex.schema.dropTableIfExists("users");
}

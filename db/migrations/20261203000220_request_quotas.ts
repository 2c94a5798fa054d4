import type { Knex } from "knex";

// Per-user quotas for expensive reads (ledger verify and export, FHIR export,
// forecasts), counted in the database so every app server shares them.
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable("request_quotas", (t) => {
    t.string("subject", 64).notNullable();
    t.string("bucket", 32).notNullable();
    t.datetime("window_start", { precision: 3 }).notNullable();
    t.integer("used").unsigned().notNullable();
    t.primary(["subject", "bucket", "window_start"]);
    t.index(["window_start"], "request_quotas_window_start_index");
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTableIfExists("request_quotas");
}

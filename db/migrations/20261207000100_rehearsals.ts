import type { Knex } from "knex";

// Protocol rehearsals: a run is asked for (queued), claimed by one app
// process (a conditional update, so two servers never run it twice), run in a
// worker thread (progress and a heartbeat written as it goes; a run whose
// heartbeat stops is claimed again) and stored with everything it used — the
// settings, the full parameters with the protocol's orders (a later edit of a
// step table cannot change what a stored run meant) and the seed.

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable("rehearsals", (t) => {
    t.increments("id").primary();
    t.integer("unit_id").unsigned().notNullable().references("units.id");
    t.string("label", 80).notNullable();
    t.enu("status", ["queued", "running", "done", "failed"]).notNullable().defaultTo("queued");
    t.decimal("progress", 5, 4).notNullable().defaultTo(0);
    t.integer("seed").unsigned().notNullable();
    t.smallint("patients").unsigned().notNullable();
    t.smallint("hours").unsigned().notNullable();
    // JSON text: the form's figures and the tables used (RehearsalSettings + table refs).
    t.text("settings_json", "longtext").notNullable();
    // JSON text: the engine's RehearsalParameters, protocol orders included.
    t.text("parameters_json", "longtext").notNullable();
    // JSON text: models, stays, basis and elapsed time, once done.
    t.text("outcome_json", "longtext").nullable();
    t.string("error", 500).nullable();
    t.integer("requested_by").unsigned().notNullable().references("users.id");
    t.string("claimed_by", 64).nullable();
    t.smallint("attempts").unsigned().notNullable().defaultTo(0);
    t.datetime("created_at", { precision: 3 }).notNullable();
    t.datetime("started_at", { precision: 3 }).nullable();
    t.datetime("heartbeat_at", { precision: 3 }).nullable();
    t.datetime("finished_at", { precision: 3 }).nullable();
    t.index(["unit_id", "created_at"], "rehearsals_unit_created_index");
    t.index(["status", "id"], "rehearsals_status_index");
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTableIfExists("rehearsals");
}

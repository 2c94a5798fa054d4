import type { Knex } from "knex";

export async function up(knex: Knex): Promise<void> {
  // One hash chain per key (a patient, or a non-clinical area such as "admin"),
  // so writers on different patients never wait for each other's chain head.
  await knex.schema.createTable("ledger_chains", (t) => {
    t.string("chain_key", 64).primary();
    t.bigInteger("last_seq").unsigned().notNullable().defaultTo(0);
    t.specificType("last_hash", "CHAR(64)").notNullable();
  });
  await knex.schema.createTable("ledger_entries", (t) => {
    t.bigIncrements("id").primary();
    t.string("chain_key", 64).notNullable();
    t.bigInteger("chain_seq").unsigned().notNullable();
    t.specificType("prev_hash", "CHAR(64)").notNullable();
    t.specificType("hash", "CHAR(64)").notNullable();
    t.integer("actor_user_id").unsigned().nullable().references("users.id");
    t.string("actor_role", 16).notNullable();
    t.datetime("occurred_at", { precision: 3 }).notNullable();
    t.string("action", 64).notNullable();
    t.string("entity_type", 32).notNullable();
    t.string("entity_id", 64).notNullable();
    t.integer("patient_id").unsigned().nullable();
    t.integer("unit_id").unsigned().nullable();
    t.text("before_json", "longtext").nullable();
    t.text("after_json", "longtext").nullable();
    t.text("rationale").nullable();
    t.unique(["chain_key", "chain_seq"], { indexName: "ledger_entries_chain_seq_unique" });
    t.index(["entity_type", "entity_id"], "ledger_entries_entity_index");
    t.index(["patient_id", "occurred_at"], "ledger_entries_patient_id_occurred_at_index");
    t.index(["occurred_at"], "ledger_entries_occurred_at_index");
    t.index(["actor_user_id", "occurred_at"], "ledger_entries_actor_occurred_at_index");
  });
  // Append-only at the database level: no account, the application's included,
  // can rewrite or remove history with plain SQL.
  await knex.raw(`CREATE TRIGGER ledger_entries_no_update BEFORE UPDATE ON ledger_entries
    FOR EACH ROW SIGNAL SQLSTATE '45000' SET MESSAGE_TEXT = 'ledger_entries is append-only: UPDATE refused'`);
  await knex.raw(`CREATE TRIGGER ledger_entries_no_delete BEFORE DELETE ON ledger_entries
    FOR EACH ROW SIGNAL SQLSTATE '45000' SET MESSAGE_TEXT = 'ledger_entries is append-only: DELETE refused'`);
}

export async function down(knex: Knex): Promise<void> {
  await knex.raw("DROP TRIGGER IF EXISTS ledger_entries_no_delete");
  await knex.raw("DROP TRIGGER IF EXISTS ledger_entries_no_update");
  await knex.schema.dropTableIfExists("ledger_entries");
  await knex.schema.dropTableIfExists("ledger_chains");
}

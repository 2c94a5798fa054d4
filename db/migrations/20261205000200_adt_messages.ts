import type { Knex } from "knex";

// HL7 ADT messages applied, by MSH-10: the same message sent again changes
// nothing and answers what the first one did.

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable("adt_messages", (t) => {
    t.increments("id").primary();
    t.string("control_id", 199).notNullable().unique("adt_messages_control_id_unique");
    t.string("trigger_event", 3).notNullable();
    t.integer("api_token_id").unsigned().notNullable().references("api_tokens.id");
    t.integer("patient_id").unsigned().notNullable().references("patients.id");
    t.text("outcome_json").notNullable();
    t.datetime("received_at", { precision: 3 }).notNullable();
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTableIfExists("adt_messages");
}

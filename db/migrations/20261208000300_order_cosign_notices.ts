import type { Knex } from "knex";

// Reminders and the escalation of verbal and telephone orders waiting for a
// co-signature. The primary key (order, step) is the claim: two workers on two
// servers may both find a step due, only one row lands, and only the worker
// whose row landed queues the e-mail, in the same transaction.
export async function up(knex: Knex): Promise<void> {
  if (await knex.schema.hasTable("order_cosign_notices")) return;
  await knex.schema.createTable("order_cosign_notices", (t) => {
    t.integer("order_id").unsigned().notNullable().references("orders.id");
    /** "remind-1", "remind-2", … or "escalate". */
    t.string("step", 16).notNullable();
    t.enum("kind", ["remind", "escalate"]).notNullable();
    t.integer("unit_id").unsigned().notNullable().references("units.id");
    /** How many e-mails the step queued (0: nobody to tell; the ledger row says why). */
    t.tinyint("mailed").unsigned().notNullable();
    t.datetime("due_at", { precision: 3 }).notNullable();
    t.datetime("created_at", { precision: 3 }).notNullable();
    t.primary(["order_id", "step"]);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTableIfExists("order_cosign_notices");
}

import type { Knex } from "knex";

// Whether an adjustment applied the engine's proposed step (the bedside
// proposal recomputed as it is saved): null when there was no proposal,
// including every adjustment saved before this column. The Orders report
// counts the share that followed it.

export async function up(knex: Knex): Promise<void> {
  if (!(await knex.schema.hasColumn("adjustments", "followed_proposal"))) {
    await knex.schema.alterTable("adjustments", (t) => {
      t.boolean("followed_proposal").nullable();
    });
  }
}

export async function down(knex: Knex): Promise<void> {
  if (await knex.schema.hasColumn("adjustments", "followed_proposal")) {
    await knex.schema.alterTable("adjustments", (t) => {
      t.dropColumn("followed_proposal");
    });
  }
}

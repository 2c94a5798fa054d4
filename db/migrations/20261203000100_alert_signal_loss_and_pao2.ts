import type { Knex } from "knex";

// Two new alert kinds (monitor signal lost; PaO2 above the order's PaO2 band)
// and outbox mail that is cancelled, with the reason, instead of sent (an
// alert resolved or acknowledged before its e-mail left). MariaDB commits each
// ALTER on its own, so each statement is safe to run again.

const KINDS_BEFORE = ["below_band", "above_band", "limits_exhausted", "reassessment_overdue"];
const KINDS_AFTER = [...KINDS_BEFORE, "signal_loss", "pao2_above_band"];

const enumOf = (values: readonly string[]) => `ENUM(${values.map((v) => `'${v}'`).join(", ")})`;

export async function up(knex: Knex): Promise<void> {
  await knex.raw(`ALTER TABLE alerts MODIFY kind ${enumOf(KINDS_AFTER)} NOT NULL`);
  await knex.raw(`ALTER TABLE alert_email_preferences MODIFY kind ${enumOf(KINDS_AFTER)} NOT NULL`);
  await knex.raw(
    `ALTER TABLE mail_outbox MODIFY state ENUM('pending', 'sent', 'cancelled') NOT NULL DEFAULT 'pending'`,
  );
  if (!(await knex.schema.hasColumn("mail_outbox", "cancel_reason"))) {
    await knex.schema.alterTable("mail_outbox", (t) => {
      t.string("cancel_reason", 300).nullable();
      t.datetime("cancelled_at", { precision: 3 }).nullable();
    });
  }
}

export async function down(knex: Knex): Promise<void> {
  await knex("mail_outbox").where({ state: "cancelled" }).delete();
  if (await knex.schema.hasColumn("mail_outbox", "cancel_reason")) {
    await knex.schema.alterTable("mail_outbox", (t) => {
      t.dropColumn("cancel_reason");
      t.dropColumn("cancelled_at");
    });
  }
  await knex.raw(
    `ALTER TABLE mail_outbox MODIFY state ENUM('pending', 'sent') NOT NULL DEFAULT 'pending'`,
  );
  await knex("alert_email_preferences")
    .whereIn("kind", ["signal_loss", "pao2_above_band"])
    .delete();
  await knex.raw(
    `ALTER TABLE alert_email_preferences MODIFY kind ${enumOf(KINDS_BEFORE)} NOT NULL`,
  );
  await knex.raw(`ALTER TABLE alerts MODIFY kind ${enumOf(KINDS_BEFORE)} NOT NULL`);
}

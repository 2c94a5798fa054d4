import type { Knex } from "knex";
import type { Actor } from "../auth/actor";
import { once } from "../idempotency";
import { appendLedger } from "../ledger/service";
import { findOpenAdmission } from "./access";
import type { HeightData } from "./schema";

// Recording a patient's height at the bedside: what a ventilator order and a
// ventilator check need for the predicted body weight, and never guess.

export type HeightView = { patientId: number; heightCm: number; previousHeightCm: number | null };

/** Records the height of an admitted patient of the actor's units, with its ledger row. */
export async function recordHeight(
  knex: Knex,
  actor: Actor,
  input: HeightData,
  now: Date = new Date(),
): Promise<HeightView> {
  const admission = await findOpenAdmission(knex, actor, input.patientId);
  // Stored to one decimal (DECIMAL(5,1)): the view and the ledger say what was stored.
  const heightCm = Math.round(input.heightCm * 10) / 10;
  return once(knex, actor.id, input.idempotencyKey, "patient.height", async (trx) => {
    const before = (await trx("patients")
      .where({ id: input.patientId })
      .forUpdate()
      .first("height_cm", "version")) as { height_cm: number | null; version: number };
    await trx("patients")
      .where({ id: input.patientId })
      .update({ height_cm: heightCm, version: before.version + 1 });
    const previousHeightCm = before.height_cm === null ? null : Number(before.height_cm);
    await appendLedger(
      trx,
      actor,
      {
        action: "patient.update",
        entityType: "patient",
        entityId: input.patientId,
        patientId: input.patientId,
        unitId: admission.unitId,
        before: { heightCm: previousHeightCm },
        after: { heightCm },
        rationale: "Height recorded at the bedside",
      },
      now,
    );
    return { patientId: input.patientId, heightCm, previousHeightCm };
  });
}

import type { Knex } from "knex";
import type { Actor } from "../auth/actor";
import { ConflictError, NotFoundError } from "../errors";
import { appendLedger, lockPatientChain } from "../ledger/service";
import { restartWatch } from "./detect";
import { closeAlert, lockWatch, saveWatch, type OpenAlertRow } from "./lifecycle";
import { cancelPendingMail } from "./outbox";
import { type AcknowledgeData, type ResolveData } from "./schema";
import { transact } from "../transaction";

// The steps a clinician takes on an alert: acknowledge it, or close it with a reason.

type AlertForUpdate = OpenAlertRow & {
  admission_id: number;
  patient_id: number;
  unit_id: number;
  acknowledged_at: Date | null;
  acknowledged_by_name: string | null;
};

async function lockAlertForActor(
  trx: Knex.Transaction,
  actor: Actor,
  alertId: number,
): Promise<AlertForUpdate> {
  const found = (await trx("alerts").where({ id: alertId }).first("patient_id", "unit_id")) as
    { patient_id: number; unit_id: number } | undefined;
  if (!found || !actor.unitIds.includes(found.unit_id))
    throw new NotFoundError("No alert with that id on your units.");
  // The patient's chain first, as every clinical write takes it (lib/ledger lockPatientChain).
  await lockPatientChain(trx, found.patient_id);
  const row = (await trx("alerts as a")
    .leftJoin("users as u", "u.id", "a.acknowledged_by")
    .where("a.id", alertId)
    .forUpdate()
    .first(
      "a.id",
      "a.kind",
      "a.grade",
      "a.state",
      "a.escalation_level",
      "a.version",
      "a.admission_id",
      "a.patient_id",
      "a.unit_id",
      "a.acknowledged_at",
      "u.name as acknowledged_by_name",
    )) as AlertForUpdate | undefined;
  if (!row || !actor.unitIds.includes(row.unit_id))
    throw new NotFoundError("No alert with that id on your units.");
  return row;
}

export type AlertStepResult = { id: number; state: "acknowledged" | "resolved"; version: number };

/** A clinician has seen the alert and is acting: escalation stops. */
export async function acknowledgeAlert(
  knex: Knex,
  actor: Actor,
  input: AcknowledgeData,
  now: Date = new Date(),
): Promise<AlertStepResult> {
  return transact(knex, async (trx) => {
    const alert = await lockAlertForActor(trx, actor, input.alertId);
    if (alert.state === "resolved") throw new ConflictError("This alert is already resolved.");
    if (alert.state === "acknowledged")
      throw new ConflictError(
        `Already acknowledged by ${alert.acknowledged_by_name ?? "a colleague"} at ${new Date(alert.acknowledged_at!).toISOString()}.`,
      );
    await trx("alerts")
      .where({ id: alert.id })
      .update({
        state: "acknowledged",
        acknowledged_at: now,
        acknowledged_by: actor.id,
        acknowledge_note: input.note ?? null,
        next_escalation_at: null,
        version: alert.version + 1,
      });
    // Someone is acting: a notice or escalation still waiting to leave would only be noise.
    const cancelled = await cancelPendingMail(
      trx,
      alert.id,
      `Acknowledged at ${now.toISOString()} before this e-mail left.`,
      now,
      ["notify", "escalate"],
    );
    await appendLedger(
      trx,
      actor,
      {
        action: "alert.acknowledge",
        entityType: "alert",
        entityId: alert.id,
        patientId: alert.patient_id,
        unitId: alert.unit_id,
        before: { state: alert.state, escalationLevel: alert.escalation_level },
        after: {
          state: "acknowledged",
          ...(cancelled.length ? { mailCancelled: cancelled } : {}),
        },
        rationale: input.note ?? null,
      },
      now,
    );
    return { id: alert.id, state: "acknowledged" as const, version: alert.version + 1 };
  });
}

/** A clinician closes the alert with a reason (detection closes its own). */
export async function resolveAlert(
  knex: Knex,
  actor: Actor,
  input: ResolveData,
  now: Date = new Date(),
): Promise<AlertStepResult> {
  return transact(knex, async (trx) => {
    const alert = await lockAlertForActor(trx, actor, input.alertId);
    if (alert.state === "resolved") throw new ConflictError("This alert is already resolved.");
    await closeAlert(
      trx,
      actor,
      { patientId: alert.patient_id, unitId: alert.unit_id },
      alert,
      input.reason,
      now,
      now,
      actor.id,
    );
    // An excursion closed by hand starts detection afresh: the monitor needs a
    // whole new window out of band before it opens another one.
    if (alert.kind === "below_band" || alert.kind === "above_band") {
      const state = await lockWatch(trx, alert.admission_id, now);
      restartWatch(state);
      await saveWatch(trx, alert.admission_id, state, now);
    }
    return { id: alert.id, state: "resolved" as const, version: alert.version + 1 };
  });
}

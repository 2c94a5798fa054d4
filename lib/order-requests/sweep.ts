import type { Knex } from "knex";
import { recipientsFor, unitCover, type AlertRecipient } from "../alerts/recipients";
import { appendLedger, lockPatientChain, SYSTEM_ACTOR } from "../ledger/service";
import { transact } from "../transaction";
import { getOrderRequest } from "./queries";
import { mailRequest, orderRequestEscalateMs } from "./service";

/**
 * Escalation of requests nobody answered in time, run by the alert worker:
 * like an unacknowledged alert at its last level, it goes again to the
 * physician level of the alerts' recipients (assigned physician, else the
 * prescriber) and now also to whoever covers the unit (charge nurse, else the
 * fallback address). Once; each request in its own transaction.
 */
export async function escalateOrderRequests(
  knex: Knex,
  now: Date = new Date(),
  escalateAfterMs: number = orderRequestEscalateMs(),
): Promise<number> {
  const due = (await knex("order_requests")
    .where({ state: "open" })
    .where("next_escalation_at", "<=", now)
    .orderBy("next_escalation_at")
    .limit(200)
    .select("id", "patient_id")) as { id: number; patient_id: number }[];
  let moved = 0;
  for (const { id, patient_id } of due) {
    // Counted after the commit: a retried attempt must not count twice.
    const done = await transact(knex, async (trx) => {
      await lockPatientChain(trx, patient_id);
      await trx("order_requests").where({ id }).forUpdate().first("id");
      const before = await getOrderRequest(trx, id);
      if (!before || before.state !== "open") return false;
      const at = (await trx("order_requests").where({ id }).first("next_escalation_at")) as {
        next_escalation_at: Date | null;
      };
      if (!at.next_escalation_at || new Date(at.next_escalation_at).getTime() > now.getTime())
        return false;
      const physicians = await recipientsFor(
        trx,
        { bedId: before.bedId, unitId: before.unitId, orderId: before.orderId },
        2,
        now,
      );
      const cover = await unitCover(trx, before.unitId, now);
      const recipients: AlertRecipient[] = [];
      for (const r of [...physicians, ...cover])
        if (!recipients.some((x) => x.email === r.email)) recipients.push(r);
      const told = recipients.map((r) => ({ name: r.name, basis: r.basis }));
      await trx("order_requests")
        .where({ id })
        .update({
          state: "escalated",
          escalation_level: 1,
          escalated_at: now,
          next_escalation_at: null,
          told_json: JSON.stringify([...before.told, told]),
          version: before.version + 1,
        });
      const minutes = Math.round(escalateAfterMs / 60_000);
      const messageIds = await mailRequest(trx, before, "escalate", recipients, now, {
        escalateMinutes: minutes,
      });
      await appendLedger(
        trx,
        SYSTEM_ACTOR,
        {
          action: "order_request.escalate",
          entityType: "order_request",
          entityId: id,
          patientId: before.patientId,
          unitId: before.unitId,
          before: { state: "open", escalationLevel: 0 },
          after: { state: "escalated", escalationLevel: 1, told, messageIds },
          rationale: `Not answered within ${minutes} min.`,
        },
        now,
      );
      return true;
    });
    if (done) moved++;
  }
  return moved;
}

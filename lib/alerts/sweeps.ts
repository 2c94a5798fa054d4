import type { Knex } from "knex";
import { appendLedger, lockPatientChain, SYSTEM_ACTOR } from "../ledger/service";
import { alertConfig, type AlertConfig } from "./config";
import { checkSignal, type WatchEvent } from "./detect";
import { reassessmentOverdueMinutes } from "./due";
import {
  lockWatch,
  noteRecipients,
  openAlert,
  openAlertOf,
  saveWatch,
  type OpenAlertRow,
} from "./lifecycle";
import { queueAlertMail } from "./outbox";
import { applyEvents, currentOrder } from "./triggers";
import { transact } from "../transaction";

// Time-driven alert work the worker runs: escalation of what nobody
// acknowledged, reassessments that fell due, and monitors that went silent.

/**
 * Escalation: an alert nobody acknowledged in time goes to the next level —
 * the assigned therapist, then the responsible physician. Each alert moves in
 * its own transaction, so one failure does not hold back the others.
 */
export async function escalateDueAlerts(
  knex: Knex,
  now: Date = new Date(),
  cfg: AlertConfig = alertConfig(),
): Promise<number> {
  const due = (await knex("alerts")
    .whereIn("state", ["opened", "notified", "escalated"])
    .where("next_escalation_at", "<=", now)
    .orderBy("next_escalation_at")
    .limit(200)
    .pluck("id")) as number[];
  let moved = 0;
  for (const id of due) {
    // Counted after the commit: a retried attempt must not count twice.
    const done = await transact(knex, async (trx) => {
      const owner = (await trx("alerts").where({ id }).first("patient_id")) as {
        patient_id: number;
      };
      await lockPatientChain(trx, owner.patient_id);
      const a = (await trx("alerts")
        .where({ id })
        .forUpdate()
        .first(
          "id",
          "state",
          "escalation_level",
          "next_escalation_at",
          "patient_id",
          "unit_id",
          "version",
        )) as
        | (OpenAlertRow & { next_escalation_at: Date | null; patient_id: number; unit_id: number })
        | undefined;
      if (!a || a.state === "acknowledged" || a.state === "resolved") return;
      if (!a.next_escalation_at || new Date(a.next_escalation_at).getTime() > now.getTime()) return;
      const level = Math.min(2, a.escalation_level + 1);
      await trx("alerts")
        .where({ id })
        .update({
          state: "escalated",
          escalation_level: level,
          escalated_at: now,
          next_escalation_at: level < 2 ? new Date(now.getTime() + cfg.escalateAfterMs) : null,
          version: a.version + 1,
        });
      const mail = await queueAlertMail(trx, id, level, `escalate-${level}`, now);
      await noteRecipients(trx, id, level, mail.told);
      await appendLedger(
        trx,
        SYSTEM_ACTOR,
        {
          action: "alert.escalate",
          entityType: "alert",
          entityId: id,
          patientId: a.patient_id,
          unitId: a.unit_id,
          before: { state: a.state, escalationLevel: a.escalation_level },
          after: {
            state: "escalated",
            escalationLevel: level,
            mailQueuedFor: mail.mailed,
            told: mail.told,
            notAssigned: mail.recipients.length === 0,
          },
          rationale: `Not acknowledged within ${Math.round(cfg.escalateAfterMs / 60_000)} min.`,
        },
        now,
      );
      return true;
    });
    if (done) moved++;
  }
  return moved;
}

/** Opens "reassessment overdue" for every admission past its order's interval. */
export async function openOverdueReassessments(
  knex: Knex,
  now: Date = new Date(),
  cfg: AlertConfig = alertConfig(),
): Promise<number> {
  const rows = (await knex("admissions as a")
    .join("beds as b", "b.id", "a.bed_id")
    .join("orders as o", "o.current_patient_id", "a.patient_id")
    .join("bedside_settings as s", "s.admission_id", "a.id")
    .whereNull("a.discharged_at")
    .whereNotExists(
      knex("alerts as x")
        .whereRaw("x.open_admission_id = a.id")
        .where("x.kind", "reassessment_overdue")
        .select(knex.raw("1")),
    )
    .select(
      "a.id as admission_id",
      "a.patient_id",
      "b.id as bed_id",
      "b.unit_id",
      "o.id as order_id",
      "o.reassess_minutes",
      "s.last_reassessed_at",
    )) as {
    admission_id: number;
    patient_id: number;
    bed_id: number;
    unit_id: number;
    order_id: number;
    reassess_minutes: number;
    last_reassessed_at: Date;
  }[];
  let opened = 0;
  for (const r of rows) {
    const last = new Date(r.last_reassessed_at).getTime();
    const overdue = reassessmentOverdueMinutes(last, r.reassess_minutes, now.getTime());
    if (overdue === null) continue;
    const admission = {
      admissionId: r.admission_id,
      patientId: r.patient_id,
      unitId: r.unit_id,
      bedId: r.bed_id,
    };
    // Counted after the commit: a retried attempt must not count twice.
    const done = await transact(knex, async (trx) => {
      // Re-checked under the locks: a reading may have landed meanwhile.
      await lockPatientChain(trx, r.patient_id);
      await lockWatch(trx, r.admission_id, now);
      if (await openAlertOf(trx, r.admission_id, "reassessment_overdue")) return;
      const s = (await trx("bedside_settings")
        .where({ admission_id: r.admission_id })
        .first("last_reassessed_at")) as { last_reassessed_at: Date } | undefined;
      if (
        !s ||
        reassessmentOverdueMinutes(
          new Date(s.last_reassessed_at).getTime(),
          r.reassess_minutes,
          now.getTime(),
        ) === null
      )
        return;
      await openAlert(
        trx,
        SYSTEM_ACTOR,
        admission,
        {
          kind: "reassessment_overdue",
          grade: "routine",
          startedAt: new Date(last + r.reassess_minutes * 60_000),
          orderId: r.order_id,
          band: null,
          spo2: null,
          level: 0,
          detail: {
            reassessMinutes: r.reassess_minutes,
            lastReassessedAt: new Date(last).toISOString(),
            overdueMinutes: overdue,
          },
        },
        now,
        cfg,
      );
      return true;
    });
    if (done) opened++;
  }
  return opened;
}

/**
 * Signal loss: for every admission whose monitor series went silent while an
 * excursion was pending or open, raises "monitor signal lost" (once per
 * silence). The watch rows are narrowed in SQL; each candidate is re-checked
 * under its locks in its own transaction.
 */
export async function raiseSignalLosses(
  knex: Knex,
  now: Date = new Date(),
  cfg: AlertConfig = alertConfig(),
): Promise<number> {
  const rows = (await knex("alert_watches as w")
    .join("admissions as a", "a.id", "w.admission_id")
    .join("beds as b", "b.id", "a.bed_id")
    .whereNull("a.discharged_at")
    .whereRaw("JSON_VALUE(w.state_json, '$.phase') IN ('pending', 'open')")
    .whereRaw("JSON_VALUE(w.state_json, '$.signalLostAt') IS NULL")
    .whereRaw("CAST(JSON_VALUE(w.state_json, '$.monitor.t') AS DOUBLE) <= ?", [
      now.getTime() - cfg.signalLossMs,
    ])
    .select("a.id as admission_id", "a.patient_id", "b.id as bed_id", "b.unit_id")) as {
    admission_id: number;
    patient_id: number;
    bed_id: number;
    unit_id: number;
  }[];
  let raised = 0;
  for (const r of rows) {
    const admission = {
      admissionId: r.admission_id,
      patientId: r.patient_id,
      unitId: r.unit_id,
      bedId: r.bed_id,
    };
    // Counted after the commit: a retried attempt must not count twice.
    const done = await transact(knex, async (trx) => {
      await lockPatientChain(trx, r.patient_id);
      const order = await currentOrder(trx, r.patient_id);
      if (!order) return;
      const state = await lockWatch(trx, r.admission_id, now);
      const events: WatchEvent[] = [];
      const band = { lower: order.spo2_lower_pct, upper: order.spo2_upper_pct };
      checkSignal(state, now.getTime(), band, cfg, (e) => events.push(e));
      if (!events.length) return;
      await applyEvents(trx, SYSTEM_ACTOR, admission, order, events, now, cfg);
      await saveWatch(trx, r.admission_id, state, now);
      return true;
    });
    if (done) raised++;
  }
  return raised;
}

import type { Knex } from "knex";
import { appendLedger, lockPatientChain, type LedgerActor } from "../ledger/service";
import { alertConfig, type AlertConfig } from "./config";
import {
  advanceWatch,
  classifyReading,
  restartWatch,
  type WatchEvent,
  type WatchState,
} from "./detect";
import { exhaustedLimits } from "./due";
import {
  closeAlert,
  lockWatch,
  openAlert,
  openAlertOf,
  resolveOpen,
  saveWatch,
  updateDetail,
  type AlertAdmission,
} from "./lifecycle";
import { queueAlertMail } from "./outbox";

// What raises and closes alerts as clinical writes land: readings (charted or
// imported), adjustments, orders and blood gases. Each runs inside the
// transaction of the write that triggered it, so an alert and its outbox
// e-mail land with that write or not at all.

export type { AlertAdmission };

/** One newly charted or imported reading, as alert detection sees it. */
export type ChartedReading = {
  takenAt: Date;
  spo2: number;
  fio2: number;
  flow: number | null;
  source: "manual" | "monitor";
};

export type OrderForAlerts = {
  id: number;
  spo2_lower_pct: number;
  spo2_upper_pct: number;
  pao2_lower_mmhg: string | number | null;
  pao2_upper_mmhg: string | number | null;
  fio2_max: string | number;
  peep_max_cmh2o: string | number | null;
  flow_max_l_min: string | number | null;
  /** Null unless the order is for invasive ventilation or NIV. */
  vent_mode: string | null;
};

export const num = (v: string | number | null): number | null => (v === null ? null : Number(v));
const kindOf = (direction: "below" | "above") =>
  direction === "below" ? ("below_band" as const) : ("above_band" as const);
const iso = (t: number) => new Date(t).toISOString();

export async function currentOrder(
  trx: Knex.Transaction,
  patientId: number,
): Promise<OrderForAlerts | undefined> {
  return (await trx("orders")
    .where({ current_patient_id: patientId })
    .first(
      "id",
      "spo2_lower_pct",
      "spo2_upper_pct",
      "pao2_lower_mmhg",
      "pao2_upper_mmhg",
      "fio2_max",
      "peep_max_cmh2o",
      "flow_max_l_min",
      "vent_mode",
    )) as OrderForAlerts | undefined;
}

/** When the bedside settings took their present values: the latest adjustment, else their last update. */
async function settingsChangedAt(
  trx: Knex.Transaction,
  admissionId: number,
  updatedAt: Date,
): Promise<number> {
  const row = (await trx("adjustments")
    .where({ admission_id: admissionId })
    .max({ at: "applied_at" })
    .first()) as { at: Date | null } | undefined;
  return row?.at ? new Date(row.at).getTime() : new Date(updatedAt).getTime();
}

/**
 * Limits reached: below the band and already at the order's ceiling. Opens
 * the alert for the physician once — but only on an SpO2 taken long enough
 * after the change to the limit for that change to show (FiO2 takes minutes to
 * reach the blood), never on a value from before it. A new order or the end
 * of the excursion closes it.
 */
async function checkLimits(
  trx: Knex.Transaction,
  actor: LedgerActor,
  admission: AlertAdmission,
  order: OrderForAlerts,
  state: WatchState,
  newestBelowAt: number | null,
  now: Date,
  cfg: AlertConfig,
): Promise<void> {
  if (state.phase !== "open" || state.direction !== "below" || newestBelowAt === null) return;
  if (await openAlertOf(trx, admission.admissionId, "limits_exhausted")) return;
  const s = (await trx("bedside_settings")
    .where({ admission_id: admission.admissionId })
    .first("fio2", "fio2_estimated", "peep_cmh2o", "flow_l_min", "updated_at")) as
    | {
        fio2: string;
        fio2_estimated: number;
        peep_cmh2o: string | null;
        flow_l_min: string | null;
        updated_at: Date;
      }
    | undefined;
  if (!s) return;
  const atMax = exhaustedLimits(
    {
      fio2: Number(s.fio2),
      fio2Estimated: Boolean(s.fio2_estimated),
      peep: num(s.peep_cmh2o),
      flow: num(s.flow_l_min),
    },
    {
      fio2Max: Number(order.fio2_max),
      peepMax: num(order.peep_max_cmh2o),
      flowMax: num(order.flow_max_l_min),
    },
  );
  if (!atMax.length) return;
  const changedAt = await settingsChangedAt(trx, admission.admissionId, s.updated_at);
  if (newestBelowAt < changedAt + cfg.limitsSettleMs) return;
  await openAlert(
    trx,
    actor,
    admission,
    {
      kind: "limits_exhausted",
      grade: state.grade ?? "routine",
      startedAt: now,
      orderId: order.id,
      band: { lower: order.spo2_lower_pct, upper: order.spo2_upper_pct },
      spo2: state.worst,
      level: 2,
      detail: {
        limitsAtMax: atMax,
        settingsChangedAt: iso(changedAt),
        spo2TakenAt: iso(newestBelowAt),
      },
    },
    now,
    cfg,
  );
}

async function applyEvent(
  trx: Knex.Transaction,
  actor: LedgerActor,
  admission: AlertAdmission,
  order: OrderForAlerts,
  e: WatchEvent,
  now: Date,
  cfg: AlertConfig,
): Promise<void> {
  const band = { lower: order.spo2_lower_pct, upper: order.spo2_upper_pct };
  // A value charted by hand: its author is at the bedside and gets no e-mail about it.
  const chartedBy = actor.id;
  switch (e.type) {
    case "open":
      await openAlert(
        trx,
        actor,
        admission,
        {
          kind: kindOf(e.direction),
          grade: e.grade,
          startedAt: new Date(e.startedAt),
          orderId: order.id,
          band,
          spo2: e.spo2,
          level: 0,
          detail: { confirmedAt: iso(e.at), confirmedBy: e.source },
          chartedBy: e.source === "manual" ? chartedBy : null,
        },
        now,
        cfg,
      );
      return;
    case "upgrade": {
      const open = await openAlertOf(trx, admission.admissionId, "below_band");
      if (!open || open.grade === "urgent") return;
      await trx("alerts")
        .where({ id: open.id })
        .update({ grade: "urgent", worst_spo2_pct: e.spo2, version: open.version + 1 });
      const mail = await queueAlertMail(trx, open.id, open.escalation_level, "urgent", now, {
        exclude: e.source === "manual" ? chartedBy : null,
      });
      await appendLedger(
        trx,
        actor,
        {
          action: "alert.upgrade",
          entityType: "alert",
          entityId: open.id,
          patientId: admission.patientId,
          unitId: admission.unitId,
          before: { grade: open.grade },
          after: { grade: "urgent", spo2: e.spo2, at: iso(e.at), mailQueuedFor: mail.mailed },
        },
        now,
      );
      return;
    }
    case "spot-check": {
      // Recorded on the alert so the clinician closing it can give it as the reason.
      const open =
        (await openAlertOf(trx, admission.admissionId, "below_band")) ??
        (await openAlertOf(trx, admission.admissionId, "above_band"));
      if (open) await updateDetail(trx, open.id, { spotCheck: { spo2: e.spo2, at: iso(e.at) } });
      return;
    }
    case "resolve": {
      const open = await openAlertOf(trx, admission.admissionId, kindOf(e.direction));
      if (open) {
        await trx("alerts").where({ id: open.id }).update({ worst_spo2_pct: e.worst });
        const reason =
          e.by === "monitor"
            ? "Back in the target band: monitor values held in band."
            : e.by === "manual"
              ? "Back in the target band: a charted value in band."
              : "SpO2 crossed to the other side of the band.";
        await closeAlert(trx, actor, admission, open, reason, new Date(e.at), now);
      }
      if (e.direction === "below")
        await resolveOpen(
          trx,
          actor,
          admission,
          "limits_exhausted",
          "SpO2 back in the target band.",
          new Date(e.at),
          now,
        );
      return;
    }
    case "signal-lost":
      if (await openAlertOf(trx, admission.admissionId, "signal_loss")) return;
      await openAlert(
        trx,
        actor,
        admission,
        {
          kind: "signal_loss",
          grade: e.grade,
          startedAt: new Date(e.at),
          orderId: order.id,
          band,
          spo2: e.worst,
          level: 0,
          detail: {
            lastSampleAt: iso(e.lastSampleAt),
            excursion: { phase: e.phase, direction: e.direction, since: iso(e.since) },
          },
        },
        now,
        cfg,
      );
      return;
    case "signal-restored":
      await resolveOpen(
        trx,
        actor,
        admission,
        "signal_loss",
        e.source === "monitor"
          ? "The monitor's signal is back."
          : "SpO2 charted at the bedside while the monitor was silent.",
        new Date(e.at),
        now,
      );
      return;
  }
}

/** Runs detection events against the database, in order. */
export async function applyEvents(
  trx: Knex.Transaction,
  actor: LedgerActor,
  admission: AlertAdmission,
  order: OrderForAlerts,
  events: readonly WatchEvent[],
  now: Date,
  cfg: AlertConfig,
): Promise<void> {
  for (const e of events) await applyEvent(trx, actor, admission, order, e, now, cfg);
}

/**
 * Runs alert detection over readings just written, inside the caller's
 * transaction. Readings must belong to one admission; any order is accepted.
 */
export async function afterReadingsCharted(
  trx: Knex.Transaction,
  actor: LedgerActor,
  admission: AlertAdmission,
  readings: readonly ChartedReading[],
  now: Date,
  cfg: AlertConfig = alertConfig(),
): Promise<void> {
  if (!readings.length) return;
  await lockPatientChain(trx, admission.patientId);
  const manual = readings.filter((r) => r.source === "manual");
  if (manual.length) {
    const latest = new Date(Math.max(...manual.map((r) => r.takenAt.getTime())));
    await resolveOpen(
      trx,
      actor,
      admission,
      "reassessment_overdue",
      "Reassessed: a reading was charted.",
      latest,
      now,
    );
  }
  const order = await currentOrder(trx, admission.patientId);
  // No order in effect: there is no band to miss.
  if (!order) return;
  const band = { lower: order.spo2_lower_pct, upper: order.spo2_upper_pct };
  const state = await lockWatch(trx, admission.admissionId, now);
  const events: WatchEvent[] = [];
  const sorted = [...readings].sort((a, b) => a.takenAt.getTime() - b.takenAt.getTime());
  let newestBelowAt: number | null = null;
  for (const r of sorted) {
    const reading = {
      t: r.takenAt.getTime(),
      spo2: r.spo2,
      fio2: r.fio2,
      flow: r.flow,
      source: r.source,
    };
    if (classifyReading(reading, band) === "below") newestBelowAt = reading.t;
    advanceWatch(state, reading, band, cfg, (e) => events.push(e));
  }
  await applyEvents(trx, actor, admission, order, events, now, cfg);
  if (state.phase === "open" && state.worst !== null) {
    await trx("alerts")
      .where({ open_admission_id: admission.admissionId, kind: kindOf(state.direction!) })
      .update({ worst_spo2_pct: state.worst });
  }
  await saveWatch(trx, admission.admissionId, state, now);
  await checkLimits(trx, actor, admission, order, state, newestBelowAt, now, cfg);
}

/**
 * After an adjustment: it is a reassessment; a wean (less FiO2 or flow) acts
 * on a PaO2 above its band. "Limits reached" waits for the next SpO2.
 */
export async function afterSettingsChanged(
  trx: Knex.Transaction,
  actor: LedgerActor,
  admission: AlertAdmission,
  appliedAt: Date,
  now: Date,
  change?: {
    from: { fio2: number; flow: number | null };
    to: { fio2: number; flow: number | null };
  },
): Promise<void> {
  await lockPatientChain(trx, admission.patientId);
  await resolveOpen(
    trx,
    actor,
    admission,
    "reassessment_overdue",
    "Reassessed: settings were adjusted.",
    appliedAt,
    now,
  );
  if (
    change &&
    (change.to.fio2 < change.from.fio2 - 1e-9 ||
      (change.to.flow ?? 0) < (change.from.flow ?? 0) - 1e-9)
  ) {
    await resolveOpen(
      trx,
      actor,
      admission,
      "pao2_above_band",
      `Weaned: FiO2 ${change.from.fio2} → ${change.to.fio2}${change.from.flow !== null || change.to.flow !== null ? `, flow ${change.from.flow ?? 0} → ${change.to.flow ?? 0} L/min` : ""}.`,
      appliedAt,
      now,
    );
  }
}

/**
 * After a new order (or a discontinued one): the physician has acted on
 * "limits reached" and on a PaO2 above its band, and the interval restarts.
 * With no order left, no band remains, so the excursion alerts close too and
 * detection starts afresh.
 */
export async function afterOrderChanged(
  trx: Knex.Transaction,
  actor: LedgerActor,
  admission: AlertAdmission,
  now: Date,
): Promise<void> {
  await lockPatientChain(trx, admission.patientId);
  for (const kind of ["limits_exhausted", "reassessment_overdue", "pao2_above_band"] as const)
    await resolveOpen(trx, actor, admission, kind, "A new order was written.", now, now);
  const order = await currentOrder(trx, admission.patientId);
  // Lung-protective limits live on a ventilator order: without one, none are left to be beyond.
  if (!order || order.vent_mode === null)
    await resolveOpen(
      trx,
      actor,
      admission,
      "lung_protection",
      "No ventilator order in effect: no lung-protective limits.",
      now,
      now,
    );
  const state = await lockWatch(trx, admission.admissionId, now);
  if (order) return;
  for (const kind of ["below_band", "above_band", "signal_loss"] as const)
    await resolveOpen(
      trx,
      actor,
      admission,
      kind,
      "The order was discontinued: no target band.",
      now,
      now,
    );
  restartWatch(state);
  await saveWatch(trx, admission.admissionId, state, now);
}

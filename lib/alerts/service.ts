import type { Knex } from "knex";
import type { Actor } from "../auth/actor";
import { assertRole } from "../auth/actor-queries";
import { ConflictError, NotFoundError } from "../errors";
import { appendLedger, lockPatientChain, SYSTEM_ACTOR, type LedgerActor } from "../ledger/service";
import { parseInput } from "../validation";
import { alertConfig, type AlertConfig } from "./config";
import {
  IDLE_WATCH,
  advanceWatch,
  exhaustedLimits,
  reassessmentOverdueMinutes,
  type WatchEvent,
  type WatchState,
} from "./detect";
import type { AlertKind } from "./kinds";
import { queueAlertMail } from "./outbox";
import {
  acknowledgeSchema,
  resolveSchema,
  type AcknowledgeInput,
  type ResolveInput,
} from "./schema";

/** One newly charted or imported reading, as alert detection sees it. */
export type ChartedReading = {
  takenAt: Date;
  spo2: number;
  fio2: number;
  flow: number | null;
  source: "manual" | "monitor";
};

/** The admission the readings belong to. */
export type AlertAdmission = {
  admissionId: number;
  patientId: number;
  unitId: number;
  bedId: number;
};

const CLINICAL = ["physician", "therapist", "nurse"] as const;

type OrderLimits = {
  id: number;
  spo2_lower_pct: number;
  spo2_upper_pct: number;
  fio2_max: string | number;
  peep_max_cmh2o: string | number | null;
  flow_max_l_min: string | number | null;
};

type OpenAlertRow = {
  id: number;
  kind: AlertKind;
  grade: "routine" | "urgent";
  state: string;
  escalation_level: number;
  version: number;
};

const num = (v: string | number | null): number | null => (v === null ? null : Number(v));

async function currentOrder(
  trx: Knex.Transaction,
  patientId: number,
): Promise<OrderLimits | undefined> {
  return (await trx("orders")
    .where({ current_patient_id: patientId })
    .first(
      "id",
      "spo2_lower_pct",
      "spo2_upper_pct",
      "fio2_max",
      "peep_max_cmh2o",
      "flow_max_l_min",
    )) as OrderLimits | undefined;
}

async function openAlertOf(
  trx: Knex.Transaction,
  admissionId: number,
  kind: AlertKind,
): Promise<OpenAlertRow | undefined> {
  return (await trx("alerts")
    .where({ open_admission_id: admissionId, kind })
    .forUpdate()
    .first("id", "kind", "grade", "state", "escalation_level", "version")) as
    OpenAlertRow | undefined;
}

/** Locks the admission's detection state (creating it), so writers on one patient queue here. */
async function lockWatch(
  trx: Knex.Transaction,
  admissionId: number,
  now: Date,
): Promise<WatchState> {
  await trx.raw(
    "INSERT INTO alert_watches (admission_id, state_json, updated_at) VALUES (?, ?, ?) ON DUPLICATE KEY UPDATE admission_id = admission_id",
    [admissionId, JSON.stringify(IDLE_WATCH), now],
  );
  const row = (await trx("alert_watches")
    .where({ admission_id: admissionId })
    .forUpdate()
    .first("state_json")) as { state_json: string };
  return { ...IDLE_WATCH, ...(JSON.parse(row.state_json) as Partial<WatchState>) };
}

async function saveWatch(trx: Knex.Transaction, admissionId: number, state: WatchState, now: Date) {
  await trx("alert_watches")
    .where({ admission_id: admissionId })
    .update({ state_json: JSON.stringify(state), updated_at: now });
}

type OpenSpec = {
  kind: AlertKind;
  grade: "routine" | "urgent";
  startedAt: Date;
  orderId: number | null;
  band: { lower: number; upper: number } | null;
  spo2: number | null;
  /** 0 starts at the nurse; limits reached go straight to the physician (2). */
  level: number;
  detail: Record<string, unknown>;
};

async function openAlert(
  trx: Knex.Transaction,
  actor: LedgerActor,
  admission: AlertAdmission,
  spec: OpenSpec,
  now: Date,
  cfg: AlertConfig,
): Promise<number> {
  const [id] = await trx("alerts").insert({
    patient_id: admission.patientId,
    admission_id: admission.admissionId,
    unit_id: admission.unitId,
    bed_id: admission.bedId,
    order_id: spec.orderId,
    kind: spec.kind,
    grade: spec.grade,
    state: "opened",
    escalation_level: spec.level,
    started_at: spec.startedAt,
    opened_at: now,
    band_lower_pct: spec.band?.lower ?? null,
    band_upper_pct: spec.band?.upper ?? null,
    trigger_spo2_pct: spec.spo2,
    worst_spo2_pct: spec.spo2,
    detail_json: JSON.stringify(spec.detail),
    next_escalation_at: spec.level < 2 ? new Date(now.getTime() + cfg.escalateAfterMs) : null,
  });
  const alertId = Number(id);
  const mail = await queueAlertMail(trx, alertId, spec.level, "notify", now);
  await noteUnassigned(trx, alertId, spec.level, mail.recipients.length === 0);
  await appendLedger(
    trx,
    actor,
    {
      action: "alert.open",
      entityType: "alert",
      entityId: alertId,
      patientId: admission.patientId,
      unitId: admission.unitId,
      after: {
        kind: spec.kind,
        grade: spec.grade,
        startedAt: spec.startedAt.toISOString(),
        band: spec.band,
        spo2: spec.spo2,
        escalationLevel: spec.level,
        ...spec.detail,
        mailQueuedFor: mail.mailed,
        notAssigned: mail.recipients.length === 0,
        optedOutOfEmail: mail.optedOut,
      },
    },
    now,
  );
  return alertId;
}

/**
 * Records on the alert whether anyone holds the duty this level reaches, so
 * the screens can say "no nurse assigned" instead of "e-mail not yet delivered".
 */
async function noteUnassigned(
  trx: Knex.Transaction,
  alertId: number,
  level: number,
  unassigned: boolean,
) {
  const row = (await trx("alerts").where({ id: alertId }).first("detail_json")) as {
    detail_json: string;
  };
  const detail = JSON.parse(row.detail_json) as Record<string, unknown>;
  await trx("alerts")
    .where({ id: alertId })
    .update({
      detail_json: JSON.stringify({ ...detail, unassignedLevel: unassigned ? level : null }),
    });
}

async function closeAlert(
  trx: Knex.Transaction,
  actor: LedgerActor,
  admission: Pick<AlertAdmission, "patientId" | "unitId">,
  alert: OpenAlertRow,
  reason: string,
  at: Date,
  now: Date,
  /** The clinician closing it by hand; null when detection resolves it (the ledger row names whose write did). */
  closedBy: number | null = null,
): Promise<void> {
  await trx("alerts")
    .where({ id: alert.id })
    .update({
      state: "resolved",
      resolved_at: at,
      resolved_by: closedBy,
      resolve_reason: reason,
      next_escalation_at: null,
      version: alert.version + 1,
    });
  await appendLedger(
    trx,
    actor,
    {
      action: "alert.resolve",
      entityType: "alert",
      entityId: alert.id,
      patientId: admission.patientId,
      unitId: admission.unitId,
      before: { state: alert.state },
      after: {
        state: "resolved",
        resolvedAt: at.toISOString(),
        by: closedBy === null ? "detection" : "clinician",
      },
      rationale: reason,
    },
    now,
  );
}

/** Resolves the admission's open alert of a kind, if there is one. */
async function resolveOpen(
  trx: Knex.Transaction,
  actor: LedgerActor,
  admission: AlertAdmission,
  kind: AlertKind,
  reason: string,
  at: Date,
  now: Date,
): Promise<void> {
  const open = await openAlertOf(trx, admission.admissionId, kind);
  if (open) await closeAlert(trx, actor, admission, open, reason, at, now);
}

/**
 * Limits reached: below the band and already at the order's ceiling. Opens
 * the alert for the physician once; a new order or the end of the excursion
 * closes it.
 */
async function checkLimits(
  trx: Knex.Transaction,
  actor: LedgerActor,
  admission: AlertAdmission,
  order: OrderLimits,
  state: WatchState,
  now: Date,
  cfg: AlertConfig,
): Promise<void> {
  if (state.phase !== "open" || state.direction !== "below") return;
  if (await openAlertOf(trx, admission.admissionId, "limits_exhausted")) return;
  const s = (await trx("bedside_settings")
    .where({ admission_id: admission.admissionId })
    .first("fio2", "fio2_estimated", "peep_cmh2o", "flow_l_min")) as
    | { fio2: string; fio2_estimated: number; peep_cmh2o: string | null; flow_l_min: string | null }
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
      detail: { limitsAtMax: atMax },
    },
    now,
    cfg,
  );
}

async function applyEvent(
  trx: Knex.Transaction,
  actor: LedgerActor,
  admission: AlertAdmission,
  order: OrderLimits,
  e: WatchEvent,
  now: Date,
  cfg: AlertConfig,
): Promise<void> {
  const band = { lower: order.spo2_lower_pct, upper: order.spo2_upper_pct };
  if (e.type === "open") {
    await openAlert(
      trx,
      actor,
      admission,
      {
        kind: e.direction === "below" ? "below_band" : "above_band",
        grade: e.grade,
        startedAt: new Date(e.startedAt),
        orderId: order.id,
        band,
        spo2: e.spo2,
        level: 0,
        detail: { confirmedAt: new Date(e.at).toISOString() },
      },
      now,
      cfg,
    );
  } else if (e.type === "upgrade") {
    const open = await openAlertOf(trx, admission.admissionId, "below_band");
    if (!open || open.grade === "urgent") return;
    await trx("alerts")
      .where({ id: open.id })
      .update({ grade: "urgent", worst_spo2_pct: e.spo2, version: open.version + 1 });
    const mail = await queueAlertMail(trx, open.id, open.escalation_level, "urgent", now);
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
        after: {
          grade: "urgent",
          spo2: e.spo2,
          at: new Date(e.at).toISOString(),
          mailQueuedFor: mail.mailed,
        },
      },
      now,
    );
  } else {
    const kind = e.direction === "below" ? "below_band" : "above_band";
    const open = await openAlertOf(trx, admission.admissionId, kind);
    if (open) {
      await trx("alerts").where({ id: open.id }).update({ worst_spo2_pct: e.worst });
      await closeAlert(
        trx,
        actor,
        admission,
        open,
        "Back in the target band.",
        new Date(e.at),
        now,
      );
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
  }
}

/**
 * Runs alert detection over readings just written, inside the caller's
 * transaction (so an alert and its outbox e-mail land with the reading or not
 * at all). Readings must belong to one admission; any order is accepted.
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
  for (const r of sorted) {
    advanceWatch(
      state,
      { t: r.takenAt.getTime(), spo2: r.spo2, fio2: r.fio2, flow: r.flow, source: r.source },
      band,
      cfg,
      (e) => events.push(e),
    );
  }
  for (const e of events) await applyEvent(trx, actor, admission, order, e, now, cfg);
  if (state.phase === "open" && state.worst !== null) {
    const kind = state.direction === "below" ? "below_band" : "above_band";
    await trx("alerts")
      .where({ open_admission_id: admission.admissionId, kind })
      .update({ worst_spo2_pct: state.worst });
  }
  await saveWatch(trx, admission.admissionId, state, now);
  await checkLimits(trx, actor, admission, order, state, now, cfg);
}

/**
 * After an adjustment: it is a reassessment, and it may have taken FiO2,
 * PEEP or flow to the order's ceiling while the patient is still below.
 */
export async function afterSettingsChanged(
  trx: Knex.Transaction,
  actor: LedgerActor,
  admission: AlertAdmission,
  appliedAt: Date,
  now: Date,
  cfg: AlertConfig = alertConfig(),
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
  const order = await currentOrder(trx, admission.patientId);
  if (!order) return;
  const state = await lockWatch(trx, admission.admissionId, now);
  await checkLimits(trx, actor, admission, order, state, now, cfg);
}

/**
 * After a new order (or a discontinued one): the physician has acted on
 * "limits reached", and the interval restarts. With no order left, no band
 * remains, so the excursion alerts close too and detection starts afresh.
 */
export async function afterOrderChanged(
  trx: Knex.Transaction,
  actor: LedgerActor,
  admission: AlertAdmission,
  now: Date,
  cfg: AlertConfig = alertConfig(),
): Promise<void> {
  await lockPatientChain(trx, admission.patientId);
  await resolveOpen(
    trx,
    actor,
    admission,
    "limits_exhausted",
    "A new order was written.",
    now,
    now,
  );
  await resolveOpen(
    trx,
    actor,
    admission,
    "reassessment_overdue",
    "A new order was written.",
    now,
    now,
  );
  const order = await currentOrder(trx, admission.patientId);
  const state = await lockWatch(trx, admission.admissionId, now);
  if (!order) {
    for (const kind of ["below_band", "above_band"] as const)
      await resolveOpen(
        trx,
        actor,
        admission,
        kind,
        "The order was discontinued: no target band.",
        now,
        now,
      );
    await saveWatch(trx, admission.admissionId, { ...IDLE_WATCH, lastT: state.lastT }, now);
    return;
  }
  await checkLimits(trx, actor, admission, order, state, now, cfg);
}

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
  raw: AcknowledgeInput,
  now: Date = new Date(),
): Promise<AlertStepResult> {
  assertRole(actor, CLINICAL);
  const input = parseInput(acknowledgeSchema, raw);
  return knex.transaction(async (trx) => {
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
        after: { state: "acknowledged" },
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
  raw: ResolveInput,
  now: Date = new Date(),
): Promise<AlertStepResult> {
  assertRole(actor, CLINICAL);
  const input = parseInput(resolveSchema, raw);
  return knex.transaction(async (trx) => {
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
    // An excursion closed by hand starts detection afresh: the next reading out of band opens a new one.
    if (alert.kind === "below_band" || alert.kind === "above_band") {
      const state = await lockWatch(trx, alert.admission_id, now);
      await saveWatch(trx, alert.admission_id, { ...IDLE_WATCH, lastT: state.lastT }, now);
    }
    return { id: alert.id, state: "resolved" as const, version: alert.version + 1 };
  });
}

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
    await knex.transaction(async (trx) => {
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
      await noteUnassigned(trx, id, level, mail.recipients.length === 0);
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
            notAssigned: mail.recipients.length === 0,
          },
          rationale: `Not acknowledged within ${Math.round(cfg.escalateAfterMs / 60_000)} min.`,
        },
        now,
      );
      moved++;
    });
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
    await knex.transaction(async (trx) => {
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
      opened++;
    });
  }
  return opened;
}

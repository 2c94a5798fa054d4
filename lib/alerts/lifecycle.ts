import type { Knex } from "knex";
import { appendLedger, type LedgerActor } from "../ledger/service";
import type { AlertConfig } from "./config";
import { idleWatch, restoreWatch, storableWatch, type WatchState } from "./detect";
import { ESCALATION_DUTIES, type AlertKind } from "./kinds";
import { cancelPendingMail, queueAlertMail, type Told } from "./outbox";

// The steps every alert goes through, whatever raised it: open (with its
// e-mail in the outbox), close, and the detection state kept per admission.
// Each runs inside the caller's transaction, after the patient's chain lock.

/** The admission the alert belongs to. */
export type AlertAdmission = {
  admissionId: number;
  patientId: number;
  unitId: number;
  bedId: number;
};

export type OpenAlertRow = {
  id: number;
  kind: AlertKind;
  grade: "routine" | "urgent";
  state: string;
  escalation_level: number;
  version: number;
  detail_json: string;
};

export async function openAlertOf(
  trx: Knex.Transaction,
  admissionId: number,
  kind: AlertKind,
): Promise<OpenAlertRow | undefined> {
  return (await trx("alerts")
    .where({ open_admission_id: admissionId, kind })
    .forUpdate()
    .first("id", "kind", "grade", "state", "escalation_level", "version", "detail_json")) as
    OpenAlertRow | undefined;
}

/** Locks the admission's detection state (creating it), so writers on one patient queue here. */
export async function lockWatch(
  trx: Knex.Transaction,
  admissionId: number,
  now: Date,
): Promise<WatchState> {
  await trx.raw(
    "INSERT INTO alert_watches (admission_id, state_json, updated_at) VALUES (?, ?, ?) ON DUPLICATE KEY UPDATE admission_id = admission_id",
    [admissionId, JSON.stringify(idleWatch()), now],
  );
  const row = (await trx("alert_watches")
    .where({ admission_id: admissionId })
    .forUpdate()
    .first("state_json")) as { state_json: string };
  return restoreWatch(JSON.parse(row.state_json) as Partial<WatchState>);
}

export async function saveWatch(
  trx: Knex.Transaction,
  admissionId: number,
  state: WatchState,
  now: Date,
): Promise<void> {
  await trx("alert_watches")
    .where({ admission_id: admissionId })
    .update({ state_json: JSON.stringify(storableWatch(state)), updated_at: now });
}

export type OpenSpec = {
  kind: AlertKind;
  grade: "routine" | "urgent";
  startedAt: Date;
  orderId: number | null;
  band: { lower: number; upper: number } | null;
  spo2: number | null;
  /** 0 starts at the nurse; limits reached go straight to the physician (2). */
  level: number;
  detail: Record<string, unknown>;
  /** Who charted the value that raised it: at the bedside already, so not e-mailed about it. */
  chartedBy?: number | null;
  /** Lower levels told at once as well (lung protection: the therapist beside the physician). */
  alsoLevels?: readonly number[];
};

export async function openAlert(
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
  const exclude = { exclude: spec.chartedBy ?? null };
  const mail = await queueAlertMail(trx, alertId, spec.level, "notify", now, exclude);
  // Each further level's mail shares the purpose, so one person at two levels gets one e-mail.
  for (const level of spec.alsoLevels ?? []) {
    const more = await queueAlertMail(trx, alertId, level, "notify", now, exclude);
    const duty = (d: number) => ESCALATION_DUTIES[Math.min(d, 2)]!;
    mail.told = [
      ...more.told.map((t) => ({ ...t, duty: duty(level) })),
      ...mail.told.map((t) => ({ ...t, duty: duty(spec.level) })),
    ];
    mail.recipients = [...more.recipients, ...mail.recipients];
    mail.mailed = [...new Set([...more.mailed, ...mail.mailed])];
    mail.optedOut = [...new Set([...more.optedOut, ...mail.optedOut])];
    mail.excluded = [...new Set([...more.excluded, ...mail.excluded])];
  }
  await noteRecipients(trx, alertId, spec.level, mail.told);
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
        told: mail.told,
        notAssigned: mail.recipients.length === 0,
        optedOutOfEmail: mail.optedOut,
        notMailedAtBedside: mail.excluded,
      },
    },
    now,
  );
  return alertId;
}

/** Merges keys into an alert's detail. */
export async function updateDetail(
  trx: Knex.Transaction,
  alertId: number,
  patch: Record<string, unknown>,
): Promise<void> {
  const row = (await trx("alerts").where({ id: alertId }).first("detail_json")) as {
    detail_json: string;
  };
  const detail = JSON.parse(row.detail_json) as Record<string, unknown>;
  await trx("alerts")
    .where({ id: alertId })
    .update({ detail_json: JSON.stringify({ ...detail, ...patch }) });
}

/**
 * Records on the alert who this level reached and why (assigned, prescriber,
 * charge nurse, fallback address), so the screens can say who was told — or
 * that nobody could be, when the unit has no charge nurse and no fallback.
 */
export async function noteRecipients(
  trx: Knex.Transaction,
  alertId: number,
  level: number,
  told: Told,
): Promise<void> {
  await updateDetail(trx, alertId, {
    unassignedLevel: told.length === 0 ? level : null,
    told: { level, recipients: told },
  });
}

export async function closeAlert(
  trx: Knex.Transaction,
  actor: LedgerActor,
  admission: Pick<AlertAdmission, "patientId" | "unitId">,
  alert: Pick<OpenAlertRow, "id" | "state" | "version">,
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
  // An e-mail still waiting would announce an alert that is over: it is not sent.
  const cancelled = await cancelPendingMail(
    trx,
    alert.id,
    `The alert was resolved at ${at.toISOString()} before this e-mail left.`,
    now,
  );
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
        ...(cancelled.length ? { mailCancelled: cancelled } : {}),
      },
      rationale: reason,
    },
    now,
  );
}

/** Resolves the admission's open alert of a kind, if there is one. */
export async function resolveOpen(
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

import type { Knex } from "knex";
import type { Actor } from "../auth/actor";
import { appendLedger } from "../ledger/service";
import {
  EMAIL_PREFERENCE_KINDS,
  type AlertKind,
  type AlertState,
  type EmailPreferenceKind,
} from "./kinds";
import type { AlertFilter, EmailPreferences } from "./schema";
import { transact } from "../transaction";

export type AlertView = {
  id: number;
  kind: AlertKind;
  grade: "routine" | "urgent";
  state: AlertState;
  escalationLevel: number;
  patient: { id: number; mrn: string; name: string };
  unit: { id: number; code: string; timeZone: string };
  bed: { id: number; label: string };
  band: { lower: number; upper: number } | null;
  triggerSpo2: number | null;
  worstSpo2: number | null;
  detail: Record<string, unknown>;
  startedAt: string;
  openedAt: string;
  notifiedAt: string | null;
  escalatedAt: string | null;
  /** When the relay last accepted an e-mail about this alert (any level). */
  lastMailAt: string | null;
  nextEscalationAt: string | null;
  acknowledged: { at: string; by: string; note: string | null } | null;
  resolved: { at: string; by: string | null; reason: string | null } | null;
  version: number;
};

type Row = {
  id: number;
  kind: AlertKind;
  grade: "routine" | "urgent";
  state: AlertState;
  escalation_level: number;
  patient_id: number;
  mrn: string;
  given_name: string;
  family_name: string;
  unit_id: number;
  unit_code: string;
  time_zone: string;
  bed_id: number;
  bed_label: string;
  band_lower_pct: number | null;
  band_upper_pct: number | null;
  trigger_spo2_pct: string | null;
  worst_spo2_pct: string | null;
  detail_json: string;
  started_at: Date;
  opened_at: Date;
  notified_at: Date | null;
  escalated_at: Date | null;
  last_mail_at: Date | null;
  next_escalation_at: Date | null;
  acknowledged_at: Date | null;
  acknowledged_by_name: string | null;
  acknowledge_note: string | null;
  resolved_at: Date | null;
  resolved_by_name: string | null;
  resolve_reason: string | null;
  version: number;
};

const iso = (d: Date | null) => (d ? new Date(d).toISOString() : null);
const num = (v: string | null) => (v === null ? null : Number(v));

function toView(r: Row): AlertView {
  return {
    id: r.id,
    kind: r.kind,
    grade: r.grade,
    state: r.state,
    escalationLevel: r.escalation_level,
    patient: { id: r.patient_id, mrn: r.mrn, name: `${r.family_name}, ${r.given_name}` },
    unit: { id: r.unit_id, code: r.unit_code, timeZone: r.time_zone },
    bed: { id: r.bed_id, label: r.bed_label },
    band:
      r.band_lower_pct !== null && r.band_upper_pct !== null
        ? { lower: r.band_lower_pct, upper: r.band_upper_pct }
        : null,
    triggerSpo2: num(r.trigger_spo2_pct),
    worstSpo2: num(r.worst_spo2_pct),
    detail: JSON.parse(r.detail_json) as Record<string, unknown>,
    startedAt: iso(r.started_at)!,
    openedAt: iso(r.opened_at)!,
    notifiedAt: iso(r.notified_at),
    escalatedAt: iso(r.escalated_at),
    lastMailAt: iso(r.last_mail_at),
    nextEscalationAt: iso(r.next_escalation_at),
    acknowledged: r.acknowledged_at
      ? { at: iso(r.acknowledged_at)!, by: r.acknowledged_by_name ?? "—", note: r.acknowledge_note }
      : null,
    resolved: r.resolved_at
      ? { at: iso(r.resolved_at)!, by: r.resolved_by_name, reason: r.resolve_reason }
      : null,
    version: r.version,
  };
}

function scoped(knex: Knex, actor: Actor): Knex.QueryBuilder {
  return knex("alerts as a")
    .join("patients as p", "p.id", "a.patient_id")
    .join("units as un", "un.id", "a.unit_id")
    .join("beds as b", "b.id", "a.bed_id")
    .leftJoin("users as ack", "ack.id", "a.acknowledged_by")
    .leftJoin("users as res", "res.id", "a.resolved_by")
    .whereIn("a.unit_id", actor.unitIds.length ? actor.unitIds : [0]);
}

const COLUMNS = [
  "a.id",
  "a.kind",
  "a.grade",
  "a.state",
  "a.escalation_level",
  "a.patient_id",
  "p.mrn",
  "p.given_name",
  "p.family_name",
  "a.unit_id",
  "un.code as unit_code",
  "un.time_zone",
  "a.bed_id",
  "b.label as bed_label",
  "a.band_lower_pct",
  "a.band_upper_pct",
  "a.trigger_spo2_pct",
  "a.worst_spo2_pct",
  "a.detail_json",
  "a.started_at",
  "a.opened_at",
  "a.notified_at",
  "a.escalated_at",
  "a.next_escalation_at",
  "a.acknowledged_at",
  "ack.name as acknowledged_by_name",
  "a.acknowledge_note",
  "a.resolved_at",
  "res.name as resolved_by_name",
  "a.resolve_reason",
  "a.version",
];

/** Alerts on the actor's units; open ones first, urgent first, newest first. */
/** Callers pass a parsed filter (the API) or their own fixed one (pages); defaults as the schema's. */
export async function listAlerts(
  knex: Knex,
  actor: Actor,
  filter: Partial<AlertFilter>,
): Promise<AlertView[]> {
  const f: AlertFilter = { status: "open", limit: 100, ...filter };
  const q = scoped(knex, actor);
  if (f.status === "open") q.whereNot("a.state", "resolved");
  if (f.status === "unacknowledged") q.whereIn("a.state", ["opened", "notified", "escalated"]);
  if (f.status === "resolved") q.where("a.state", "resolved");
  if (f.kind) q.where("a.kind", f.kind);
  if (f.unitId) q.where("a.unit_id", f.unitId);
  if (f.patientId) q.where("a.patient_id", f.patientId);
  if (f.alertId) q.where("a.id", f.alertId);
  const rows = (await q
    .select(
      knex.raw(
        "(SELECT MAX(m.sent_at) FROM mail_outbox AS m WHERE m.alert_id = a.id AND m.state = 'sent') AS last_mail_at",
      ),
    )
    // What needs someone now comes first: waiting for acknowledgement, urgent,
    // furthest escalated, the physician-level kinds before the routine ones.
    .orderByRaw("a.state = 'resolved'")
    .orderByRaw("a.state = 'acknowledged'")
    .orderByRaw("a.grade = 'urgent' DESC")
    .orderBy("a.escalation_level", "desc")
    .orderByRaw(
      "FIELD(a.kind, 'limits_exhausted', 'lung_protection', 'below_band', 'signal_loss', 'above_band', 'pao2_above_band', 'reassessment_overdue')",
    )
    .orderBy("a.opened_at", "desc")
    .limit(f.limit)
    .select(COLUMNS)) as Row[];
  return rows.map(toView);
}

export type AlertSummary = { open: number; unacknowledged: number; urgent: number };

/** The header badge: unresolved alerts on the actor's units. */
export async function alertSummary(knex: Knex, actor: Actor): Promise<AlertSummary> {
  const row = (await knex("alerts")
    .whereIn("unit_id", actor.unitIds.length ? actor.unitIds : [0])
    .whereNot("state", "resolved")
    .first(
      knex.raw("COUNT(*) AS open_count"),
      knex.raw("SUM(state IN ('opened','notified','escalated')) AS unack_count"),
      knex.raw("SUM(grade = 'urgent') AS urgent_count"),
    )) as {
    open_count: number | string;
    unack_count: number | string | null;
    urgent_count: number | string | null;
  };
  return {
    open: Number(row.open_count),
    unacknowledged: Number(row.unack_count ?? 0),
    urgent: Number(row.urgent_count ?? 0),
  };
}

export type AdmissionAlerts = {
  open: number;
  unacknowledged: number;
  urgent: boolean;
  kinds: AlertKind[];
};

/** Open alerts per admission, for the Board's column. */
export async function openAlertsByAdmission(
  knex: Knex,
  admissionIds: readonly number[],
): Promise<Map<number, AdmissionAlerts>> {
  const out = new Map<number, AdmissionAlerts>();
  if (!admissionIds.length) return out;
  const rows = (await knex("alerts")
    .whereIn("open_admission_id", admissionIds)
    .select("admission_id", "kind", "grade", "state")) as {
    admission_id: number;
    kind: AlertKind;
    grade: string;
    state: AlertState;
  }[];
  for (const r of rows) {
    const e = out.get(r.admission_id) ?? { open: 0, unacknowledged: 0, urgent: false, kinds: [] };
    e.open++;
    if (r.state !== "acknowledged") e.unacknowledged++;
    if (r.grade === "urgent") e.urgent = true;
    e.kinds.push(r.kind);
    out.set(r.admission_id, e);
  }
  return out;
}

/** The user's e-mail choices; a kind with no row is e-mailed. */
export async function getEmailPreferences(knex: Knex, userId: number): Promise<EmailPreferences> {
  const rows = (await knex("alert_email_preferences")
    .where({ user_id: userId })
    .select("kind", "email")) as {
    kind: EmailPreferenceKind;
    email: number | boolean;
  }[];
  const prefs = Object.fromEntries(
    EMAIL_PREFERENCE_KINDS.map((k) => [k, true]),
  ) as EmailPreferences;
  for (const r of rows) prefs[r.kind] = Boolean(r.email);
  return prefs;
}

/** Saves the actor's own e-mail choices, with a ledger row. */
export async function setEmailPreferences(
  knex: Knex,
  actor: Actor,
  prefs: EmailPreferences,
  now: Date = new Date(),
): Promise<EmailPreferences> {
  return transact(knex, async (trx) => {
    const before = await getEmailPreferences(trx, actor.id);
    for (const kind of EMAIL_PREFERENCE_KINDS) {
      await trx("alert_email_preferences")
        .insert({ user_id: actor.id, kind, email: prefs[kind], updated_at: now })
        .onConflict(["user_id", "kind"])
        .merge(["email", "updated_at"]);
    }
    await appendLedger(
      trx,
      actor,
      {
        action: "user.alert_email_preferences",
        entityType: "user",
        entityId: actor.id,
        before,
        after: prefs,
      },
      now,
    );
    return prefs;
  });
}

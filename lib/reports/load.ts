import type { Knex } from "knex";
import type { AlertKind } from "../alerts/kinds";
import { NotFoundError } from "../errors";
import { loadStays, type Stay } from "../rollups/stays";
import type { ShiftPattern } from "../units/shifts";
import type { AlertEvent } from "./alerts";
import type { Names } from "./groups";
import type { AdjustmentEvent, OrderSpan } from "./orders";

/**
 * The reads behind the reports: the unit, its stays, names, orders, gases,
 * manual readings, adjustments and alerts of the admissions that lay on it.
 * Never the monitor series: time measures come from the rollups.
 */

export type UnitInfo = { id: number; code: string; name: string; pattern: ShiftPattern };

export async function loadUnit(knex: Knex, unitId: number): Promise<UnitInfo> {
  const row = (await knex("units")
    .where({ id: unitId })
    .first("id", "code", "name", "time_zone", "shift_start", "shift_hours")) as
    | {
        id: number;
        code: string;
        name: string;
        time_zone: string;
        shift_start: string;
        shift_hours: number;
      }
    | undefined;
  if (!row) throw new NotFoundError("Unit not found.");
  return {
    id: row.id,
    code: row.code,
    name: row.name,
    pattern: {
      timeZone: row.time_zone,
      shiftStart: row.shift_start,
      shiftHours: Number(row.shift_hours) as ShiftPattern["shiftHours"],
    },
  };
}

export async function loadUnitStays(knex: Knex, unitId: number, from: Date, to: Date) {
  return loadStays(knex, { unitIds: [unitId], from, to });
}

export async function loadNames(
  knex: Knex,
  unitId: number,
  stays: readonly Stay[],
): Promise<Names> {
  const patientIds = [...new Set(stays.map((s) => s.patientId))];
  const [patients, beds] = (await Promise.all([
    patientIds.length
      ? knex("patients").whereIn("id", patientIds).select("id", "family_name", "given_name")
      : Promise.resolve([]),
    knex("beds").where({ unit_id: unitId }).select("id", "label"),
  ])) as [
    { id: number; family_name: string; given_name: string }[],
    { id: number; label: string }[],
  ];
  return {
    patients: new Map(patients.map((p) => [p.id, `${p.family_name}, ${p.given_name}`])),
    beds: new Map(beds.map((b) => [b.id, b.label])),
  };
}

const ids = (stays: readonly Stay[]) => [...new Set(stays.map((s) => s.admissionId))];
const patients = (stays: readonly Stay[]) => [...new Set(stays.map((s) => s.patientId))];
const ms = (d: Date | null) => (d ? d.getTime() : null);

/** The orders (not drafts) of the admissions written before `to`, with when each held. */
export async function loadOrderSpans(
  knex: Knex,
  stays: readonly Stay[],
  to: Date,
): Promise<OrderSpan[]> {
  const admissionIds = ids(stays);
  if (admissionIds.length === 0) return [];
  const rows = (await knex("orders")
    .whereIn("admission_id", admissionIds)
    .whereNot("status", "draft")
    .where("created_at", "<", to)
    .select(
      "id",
      "admission_id",
      "status",
      "entry_mode",
      "reassess_minutes",
      "pao2_upper_mmhg",
      "created_at",
      "cosigned_at",
      knex.raw("COALESCE(discontinued_at, updated_at) AS ended_at"),
    )) as {
    id: number;
    admission_id: number;
    status: string;
    entry_mode: OrderSpan["entryMode"];
    reassess_minutes: number;
    pao2_upper_mmhg: string | number | null;
    created_at: Date;
    cosigned_at: Date | null;
    ended_at: Date;
  }[];
  // Held from its writing until discontinued or superseded (as lib/rollups/bands.ts).
  return rows.map((r) => ({
    id: r.id,
    admissionId: r.admission_id,
    from: r.created_at.getTime(),
    to: r.status === "active" || r.status === "awaiting_cosign" ? Infinity : r.ended_at.getTime(),
    entryMode: r.entry_mode,
    createdAt: r.created_at.getTime(),
    cosignedAt: ms(r.cosigned_at),
    reassessMinutes: Number(r.reassess_minutes),
    pao2Upper: r.pao2_upper_mmhg === null ? null : Number(r.pao2_upper_mmhg),
  }));
}

/** Arterial gases of the admissions sampled in [from, to). */
export async function loadArterialGases(knex: Knex, stays: readonly Stay[], from: Date, to: Date) {
  if (stays.length === 0) return [];
  const rows = (await knex("blood_gases")
    .whereIn("patient_id", patients(stays))
    .whereIn("admission_id", ids(stays))
    .where({ sample_type: "arterial" })
    .where("sampled_at", ">=", from)
    .where("sampled_at", "<", to)
    .select("admission_id", "sampled_at", "pao2_mmhg")) as {
    admission_id: number;
    sampled_at: Date;
    pao2_mmhg: string | number;
  }[];
  return rows.map((r) => ({
    admissionId: r.admission_id,
    at: r.sampled_at.getTime(),
    pao2: Number(r.pao2_mmhg),
  }));
}

/** Adjustments of the admissions applied in [from, to), sorted by time. */
export async function loadAdjustments(
  knex: Knex,
  stays: readonly Stay[],
  from: Date,
  to: Date,
): Promise<AdjustmentEvent[]> {
  if (stays.length === 0) return [];
  const rows = (await knex("adjustments")
    .whereIn("patient_id", patients(stays))
    .whereIn("admission_id", ids(stays))
    .where("applied_at", ">=", from)
    .where("applied_at", "<", to)
    .orderBy("applied_at")
    .select("admission_id", "applied_at", "followed_proposal")) as {
    admission_id: number;
    applied_at: Date;
    followed_proposal: number | boolean | null;
  }[];
  return rows.map((r) => ({
    admissionId: r.admission_id,
    at: r.applied_at.getTime(),
    followedProposal: r.followed_proposal === null ? null : Boolean(r.followed_proposal),
  }));
}

/** Times of the manual readings of the admissions in [from, to), sorted. */
export async function loadManualReadingTimes(
  knex: Knex,
  stays: readonly Stay[],
  from: Date,
  to: Date,
): Promise<{ admissionId: number; at: number }[]> {
  if (stays.length === 0) return [];
  // readings_manual_index (admission_id, source, taken_at): the monitor series is never scanned.
  const rows = (await knex("readings")
    .whereIn("admission_id", ids(stays))
    .where({ source: "manual" })
    .where("taken_at", ">=", from)
    .where("taken_at", "<", to)
    .orderBy("taken_at")
    .select("admission_id", "taken_at")) as { admission_id: number; taken_at: Date }[];
  return rows.map((r) => ({ admissionId: r.admission_id, at: r.taken_at.getTime() }));
}

/** Alerts of the admissions opened in [from, to). */
export async function loadAlerts(
  knex: Knex,
  stays: readonly Stay[],
  from: Date,
  to: Date,
): Promise<AlertEvent[]> {
  if (stays.length === 0) return [];
  const rows = (await knex("alerts")
    .whereIn("patient_id", patients(stays))
    .whereIn("admission_id", ids(stays))
    .where("opened_at", ">=", from)
    .where("opened_at", "<", to)
    .select(
      "admission_id",
      "kind",
      "started_at",
      "opened_at",
      "acknowledged_at",
      "resolved_at",
      "escalated_at",
      "escalation_level",
    )) as {
    admission_id: number;
    kind: AlertKind;
    started_at: Date;
    opened_at: Date;
    acknowledged_at: Date | null;
    resolved_at: Date | null;
    escalated_at: Date | null;
    escalation_level: number;
  }[];
  return rows.map((r) => ({
    admissionId: r.admission_id,
    kind: r.kind,
    startedAt: r.started_at.getTime(),
    openedAt: r.opened_at.getTime(),
    acknowledgedAt: ms(r.acknowledged_at),
    resolvedAt: ms(r.resolved_at),
    escalated: r.escalated_at !== null || Number(r.escalation_level) > 0,
  }));
}

/** Groups sorted event times by admission. */
export function timesByAdmission(
  events: readonly { admissionId: number; at: number }[],
): Map<number, number[]> {
  const out = new Map<number, number[]>();
  for (const e of events) {
    const list = out.get(e.admissionId) ?? [];
    list.push(e.at);
    out.set(e.admissionId, list);
  }
  for (const list of out.values()) list.sort((a, b) => a - b);
  return out;
}

import type { Knex } from "knex";
import { z } from "zod";
import type { Actor } from "../auth/actor";
import { queryTime } from "../validation";
import { LEDGER_ACTIONS, type LedgerEntityType } from "./vocabulary";
import { can } from "../auth/permissions";

export const ledgerFilterSchema = z.object({
  patientId: z.coerce.number().int().positive().optional(),
  /** The patient by medical record number, as people know them. */
  mrn: z
    .string()
    .trim()
    .regex(/^[A-Za-z0-9-]{1,32}$/, "MRN must be 1 to 32 letters, digits or dashes.")
    .optional(),
  actorId: z.coerce.number().int().positive().optional(),
  action: z.enum(LEDGER_ACTIONS).optional(),
  from: queryTime("From").optional(),
  to: queryTime("To").optional(),
  /** Rows after this row in the list's order (newest first: older, or as old with a lower id). */
  before: z.coerce.number().int().positive().optional(),
  limit: z.coerce.number().int().min(1).max(500).default(50),
});
export type LedgerFilter = z.infer<typeof ledgerFilterSchema>;

export type LedgerEntryView = {
  id: number;
  chainKey: string;
  chainSeq: number;
  occurredAt: string;
  actor: { id: number | null; name: string | null; role: string };
  action: string;
  entityType: string;
  entityId: string;
  patientId: number | null;
  /** The patient as people know them; null for rows about no patient. */
  patient: { id: number; mrn: string; name: string } | null;
  unitId: number | null;
  before: string | null;
  after: string | null;
  rationale: string | null;
  hash: string;
};

function scoped(
  knex: Knex,
  actor: Actor,
  f: Omit<LedgerFilter, "limit" | "before">,
): Knex.QueryBuilder {
  const q = knex("ledger_entries as l")
    .leftJoin("users as u", "u.id", "l.actor_user_id")
    .leftJoin("patients as p", "p.id", "l.patient_id");
  // Clinical rows of the actor's units; administration rows only for those who oversee it.
  q.where((w) => {
    w.whereIn("l.unit_id", actor.unitIds.length ? actor.unitIds : [0]);
    if (can(actor, "ledger.oversee")) w.orWhereNull("l.unit_id");
  });
  if (f.patientId) q.where("l.patient_id", f.patientId);
  if (f.mrn) q.where("p.mrn", f.mrn);
  if (f.actorId) q.where("l.actor_user_id", f.actorId);
  if (f.action) q.where("l.action", f.action);
  if (f.from) q.where("l.occurred_at", ">=", f.from);
  if (f.to) q.where("l.occurred_at", "<", f.to);
  return q;
}

type Row = {
  id: number;
  chain_key: string;
  chain_seq: number;
  occurred_at: Date;
  actor_user_id: number | null;
  actor_name: string | null;
  actor_role: string;
  action: string;
  entity_type: string;
  entity_id: string;
  patient_id: number | null;
  patient_mrn: string | null;
  patient_family: string | null;
  patient_given: string | null;
  unit_id: number | null;
  before_json: string | null;
  after_json: string | null;
  rationale: string | null;
  hash: string;
};

const toView = (r: Row): LedgerEntryView => ({
  id: Number(r.id),
  chainKey: r.chain_key,
  chainSeq: Number(r.chain_seq),
  occurredAt: r.occurred_at.toISOString(),
  actor: { id: r.actor_user_id, name: r.actor_name, role: r.actor_role },
  action: r.action,
  entityType: r.entity_type,
  entityId: r.entity_id,
  patientId: r.patient_id,
  patient:
    r.patient_id !== null && r.patient_mrn !== null
      ? {
          id: r.patient_id,
          mrn: r.patient_mrn,
          name: `${(r.patient_family ?? "").toUpperCase()}, ${r.patient_given ?? ""}`.trim(),
        }
      : null,
  unitId: r.unit_id,
  before: r.before_json,
  after: r.after_json,
  rationale: r.rationale,
  hash: r.hash,
});

const COLUMNS = [
  "l.id",
  "l.chain_key",
  "l.chain_seq",
  "l.occurred_at",
  "l.actor_user_id",
  "u.name as actor_name",
  "l.actor_role",
  "l.action",
  "l.entity_type",
  "l.entity_id",
  "l.patient_id",
  "p.mrn as patient_mrn",
  "p.family_name as patient_family",
  "p.given_name as patient_given",
  "l.unit_id",
  "l.before_json",
  "l.after_json",
  "l.rationale",
  "l.hash",
];

/** A page of ledger rows, newest first, within the actor's units. */
export async function listLedger(
  knex: Knex,
  actor: Actor,
  filter: LedgerFilter,
): Promise<{ entries: LedgerEntryView[]; nextBefore: number | null }> {
  // Newest first by when it happened: ids follow commit order on one server, but
  // not the clinical time of back-dated rows, nor across a cluster's nodes.
  const q = scoped(knex, actor, filter)
    .orderBy([
      { column: "l.occurred_at", order: "desc" },
      { column: "l.id", order: "desc" },
    ])
    .limit(filter.limit + 1)
    .select(COLUMNS);
  if (filter.before) {
    const at = knex("ledger_entries").where("id", filter.before).select("occurred_at");
    q.where((w) => {
      void w
        .where("l.occurred_at", "<", at)
        .orWhere(
          (s) => void s.where("l.occurred_at", "=", at).andWhere("l.id", "<", filter.before!),
        );
    });
  }
  const rows = (await q) as Row[];
  const page = rows.slice(0, filter.limit).map(toView);
  return {
    entries: page,
    nextBefore: rows.length > filter.limit ? page[page.length - 1]!.id : null,
  };
}

/**
 * Every ledger row about one record (an order, a user…), oldest first, within
 * the actor's units like `listLedger`: another unit's rows are not returned.
 */
export async function listLedgerForEntity(
  knex: Knex,
  actor: Actor,
  entityType: LedgerEntityType,
  entityId: string | number,
): Promise<LedgerEntryView[]> {
  const rows = (await scoped(knex, actor, {})
    .where({ "l.entity_type": entityType, "l.entity_id": String(entityId) })
    .orderBy([
      { column: "l.occurred_at", order: "asc" },
      { column: "l.id", order: "asc" },
    ])
    .select(COLUMNS)) as Row[];
  return rows.map(toView);
}

function csvCell(value: string | number | null): string {
  const text = value === null ? "" : String(value);
  // Quote everything that could break a row; neutralise spreadsheet formulas.
  const safe = /^[=+\-@\t\r]/.test(text) ? `'${text}` : text;
  return /[",\n\r]/.test(safe) || safe !== text ? `"${safe.replace(/"/g, '""')}"` : safe;
}

/** The filtered ledger as CSV (RFC 4180), oldest first, streamed in batches. */
export async function* ledgerCsv(
  knex: Knex,
  actor: Actor,
  filter: Omit<LedgerFilter, "limit" | "before">,
): AsyncGenerator<string> {
  yield "id,occurred_at_utc,actor,actor_role,action,entity_type,entity_id,patient_id,unit_id,rationale,before_json,after_json,chain_key,chain_seq,hash\r\n";
  let last: { at: Date; id: number } | null = null;
  for (;;) {
    const q = scoped(knex, actor, filter)
      .orderBy([
        { column: "l.occurred_at", order: "asc" },
        { column: "l.id", order: "asc" },
      ])
      .limit(1000)
      .select(COLUMNS);
    if (last) {
      const { at, id } = last;
      q.where((w) => {
        void w
          .where("l.occurred_at", ">", at)
          .orWhere((s) => void s.where("l.occurred_at", "=", at).andWhere("l.id", ">", id));
      });
    }
    const rows = (await q) as Row[];
    if (rows.length === 0) return;
    for (const r of rows) {
      const v = toView(r);
      yield (
        [
          v.id,
          v.occurredAt,
          v.actor.name,
          v.actor.role,
          v.action,
          v.entityType,
          v.entityId,
          v.patientId,
          v.unitId,
          v.rationale,
          v.before,
          v.after,
          v.chainKey,
          v.chainSeq,
          v.hash,
        ]
          .map(csvCell)
          .join(",") + "\r\n"
      );
    }
    const tail = rows[rows.length - 1]!;
    last = { at: tail.occurred_at, id: Number(tail.id) };
  }
}

import type { Knex } from "knex";
import type { Actor } from "../auth/actor";
import type { LedgerAction, LedgerEntityType } from "./vocabulary";
import { GENESIS_HASH, keyedLedgerHash } from "./hash";
import { ledgerKeys } from "./keys";

export type LedgerInput = {
  action: LedgerAction;
  entityType: LedgerEntityType;
  entityId: string | number;
  /** Clinical writes chain per patient; everything else chains per area. */
  patientId?: number | null;
  unitId?: number | null;
  before?: unknown;
  after?: unknown;
  rationale?: string | null;
};

/**
 * Who wrote a ledger row: a signed-in user, or — for work no person did at that
 * moment — the system (alert sweeps, mail delivery) or an interface engine's
 * API token. The latter two have no user id.
 */
export type LedgerActor = Pick<Actor, "id" | "role"> | { id: null; role: "system" | "interface" };

/** Work no person did at that moment: alert sweeps and mail delivery. */
export const SYSTEM_ACTOR: LedgerActor = { id: null, role: "system" };

export type LedgerRow = {
  id: number;
  chainKey: string;
  chainSeq: number;
  hash: string;
};

/** The chain a write belongs to: one per patient, else one for administration. */
export function chainKeyFor(input: Pick<LedgerInput, "patientId">): string {
  return input.patientId ? `patient:${input.patientId}` : "admin";
}

async function lockChainHead(
  trx: Knex.Transaction,
  chainKey: string,
): Promise<{ last_seq: number | string; last_hash: string }> {
  // One statement creates the head if missing and takes its row lock; RETURNING
  // gives the head as locked (the latest committed one, not this transaction's
  // snapshot).
  const [rows] = (await trx.raw(
    "INSERT INTO ledger_chains (chain_key, last_seq, last_hash) VALUES (?, 0, ?) ON DUPLICATE KEY UPDATE chain_key = chain_key RETURNING last_seq, last_hash",
    [chainKey, GENESIS_HASH],
  )) as [{ last_seq: number | string; last_hash: string }[]];
  return rows[0]!;
}

const INSERT_ENTRY = `INSERT INTO ledger_entries (chain_key, chain_seq, prev_hash, hash,
  actor_user_id, actor_role, occurred_at, action, entity_type, entity_id, patient_id, unit_id,
  before_json, after_json, rationale) VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?)`;

/**
 * Takes the patient's chain lock up front. Clinical writes take it first (they
 * append their ledger row before anything else locks), so work that locks
 * other rows of the same patient and then writes the ledger — alert steps —
 * calls this first to keep one lock order and never deadlock with them.
 */
export async function lockPatientChain(trx: Knex.Transaction, patientId: number): Promise<void> {
  await lockChainHead(trx, chainKeyFor({ patientId }));
}

/**
 * Appends one hash-chained ledger row inside the caller's transaction. Only the
 * chain's head row is locked, so writes on different patients do not queue
 * behind each other. The row's hash is an HMAC under LEDGER_HMAC_KEY, so an
 * account that can INSERT but does not hold the key cannot append a row that
 * verifies; triggers let the chain head advance only one stored row at a time,
 * and move it with each stored row. Round trips: the head (locked), the row.
 */
export async function appendLedger(
  trx: Knex.Transaction,
  actor: LedgerActor,
  input: LedgerInput,
  now: Date = new Date(),
): Promise<LedgerRow> {
  const chainKey = chainKeyFor(input);
  const head = await lockChainHead(trx, chainKey);

  const occurredAt = new Date(Math.floor(now.getTime()));
  const fields = {
    chainKey,
    chainSeq: Number(head.last_seq) + 1,
    prevHash: head.last_hash,
    actorUserId: actor.id,
    actorRole: actor.role,
    occurredAt,
    action: input.action,
    entityType: input.entityType,
    entityId: String(input.entityId),
    patientId: input.patientId ?? null,
    unitId: input.unitId ?? null,
    beforeJson: input.before === undefined ? null : JSON.stringify(input.before),
    afterJson: input.after === undefined ? null : JSON.stringify(input.after),
    rationale: input.rationale ?? null,
  };
  const hash = keyedLedgerHash(ledgerKeys(), fields);
  // Raw SQL: a ledger row goes with every write, and the query builder cost more than the statement.
  const [inserted] = (await trx.raw(INSERT_ENTRY, [
    fields.chainKey,
    fields.chainSeq,
    fields.prevHash,
    hash,
    fields.actorUserId,
    fields.actorRole,
    fields.occurredAt,
    fields.action,
    fields.entityType,
    fields.entityId,
    fields.patientId,
    fields.unitId,
    fields.beforeJson,
    fields.afterJson,
    fields.rationale,
  ])) as [{ insertId: number | string }];
  // The insert moved the chain head onto this row (trigger ledger_entries_advance_head).
  return { id: Number(inserted.insertId), chainKey, chainSeq: fields.chainSeq, hash };
}

import type { Knex } from "knex";
import { GENESIS_HASH, hashLedgerEntry } from "./hash";

export type LedgerVerification = {
  ok: boolean;
  checked: number;
  firstBroken: null | { id: number; chainKey: string; chainSeq: number; problem: string };
};

type StoredRow = {
  id: number;
  chain_key: string;
  chain_seq: number;
  prev_hash: string;
  hash: string;
  actor_user_id: number | null;
  actor_role: string;
  occurred_at: Date;
  action: string;
  entity_type: string;
  entity_id: string;
  patient_id: number | null;
  unit_id: number | null;
  before_json: string | null;
  after_json: string | null;
  rationale: string | null;
};

/**
 * Walks every chain in order, recomputing each hash and checking the link to
 * the previous row and the sequence numbers; reports the first broken link.
 */
export async function verifyLedger(knex: Knex, batchSize = 2000): Promise<LedgerVerification> {
  const expected = new Map<string, { seq: number; hash: string }>();
  let checked = 0;
  let lastId = 0;
  for (;;) {
    const rows = (await knex("ledger_entries")
      .where("id", ">", lastId)
      .orderBy("id")
      .limit(batchSize)) as StoredRow[];
    if (rows.length === 0) break;
    for (const row of rows) {
      const prev = expected.get(row.chain_key) ?? { seq: 0, hash: GENESIS_HASH };
      const broken = (problem: string): LedgerVerification => ({
        ok: false,
        checked,
        firstBroken: { id: row.id, chainKey: row.chain_key, chainSeq: row.chain_seq, problem },
      });
      if (Number(row.chain_seq) !== prev.seq + 1) {
        return broken(`sequence jumps from ${prev.seq} to ${row.chain_seq}`);
      }
      if (row.prev_hash !== prev.hash) return broken("previous-hash link does not match");
      const recomputed = hashLedgerEntry({
        chainKey: row.chain_key,
        chainSeq: Number(row.chain_seq),
        prevHash: row.prev_hash,
        actorUserId: row.actor_user_id,
        actorRole: row.actor_role,
        occurredAt: row.occurred_at,
        action: row.action,
        entityType: row.entity_type,
        entityId: row.entity_id,
        patientId: row.patient_id,
        unitId: row.unit_id,
        beforeJson: row.before_json,
        afterJson: row.after_json,
        rationale: row.rationale,
      });
      if (recomputed !== row.hash) return broken("row content does not match its hash");
      expected.set(row.chain_key, { seq: Number(row.chain_seq), hash: row.hash });
      checked += 1;
    }
    lastId = rows[rows.length - 1]!.id;
  }
  // A chain head that points past the last stored row means rows went missing.
  const heads = (await knex("ledger_chains").select("chain_key", "last_seq", "last_hash")) as {
    chain_key: string;
    last_seq: number;
    last_hash: string;
  }[];
  for (const head of heads) {
    const seen = expected.get(head.chain_key) ?? { seq: 0, hash: GENESIS_HASH };
    if (Number(head.last_seq) !== seen.seq || head.last_hash !== seen.hash) {
      return {
        ok: false,
        checked,
        firstBroken: {
          id: 0,
          chainKey: head.chain_key,
          chainSeq: seen.seq + 1,
          problem: `chain head expects row ${head.last_seq}, last stored row is ${seen.seq}`,
        },
      };
    }
  }
  return { ok: true, checked, firstBroken: null };
}

/** The unit a patient chain belongs to (the patient's latest admission); null for other chains. */
export async function chainUnitId(knex: Knex, chainKey: string): Promise<number | null> {
  const patientId = /^patient:(\d+)$/.exec(chainKey)?.[1];
  if (!patientId) return null;
  const row = (await knex("admissions as a")
    .join("beds as b", "b.id", "a.bed_id")
    .where("a.patient_id", Number(patientId))
    .orderBy("a.admitted_at", "desc")
    .first("b.unit_id")) as { unit_id: number } | undefined;
  return row?.unit_id ?? null;
}

import type { Knex } from "knex";
import { getEnv } from "../../lib/env";
import {
  deriveLedgerKeys,
  GENESIS_HASH,
  keyedLedgerHash,
  unkeyedLedgerHash,
  type HashedLedgerFields,
} from "../../lib/ledger/hash";

// Every ledger row's hash becomes an HMAC-SHA256 under LEDGER_HMAC_KEY (set it
// as the app will run with before migrating). Existing rows are re-keyed here,
// as the owner, instead of being kept on the old unkeyed scheme behind a
// version column: a verifier that still accepted the old scheme would accept
// rows forged with it. Nothing is rewritten unless every chain first verifies
// under the old scheme, so tampered history is never re-signed. Run it with the
// application stopped.

type Hasher = (f: HashedLedgerFields) => string;

const NO_UPDATE_TRIGGER = `CREATE TRIGGER ledger_entries_no_update BEFORE UPDATE ON ledger_entries
    FOR EACH ROW SIGNAL SQLSTATE '45000' SET MESSAGE_TEXT = 'ledger_entries is append-only: UPDATE refused'`;

type Row = {
  id: number;
  chain_key: string;
  chain_seq: number | string;
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

async function rehash(knex: Knex, scheme: string, from: Hasher, to: Hasher): Promise<void> {
  await knex.raw(
    "CREATE TEMPORARY TABLE ledger_rehash (id BIGINT UNSIGNED PRIMARY KEY, prev_hash CHAR(64) NOT NULL, hash CHAR(64) NOT NULL)",
  );
  try {
    // Pass over every row: check it under the old scheme, stage its new hash.
    const oldTail = new Map<string, { seq: number; hash: string }>();
    const newTail = new Map<string, string>();
    for (let lastId = 0; ;) {
      const rows = (await knex("ledger_entries")
        .where("id", ">", lastId)
        .orderBy("id")
        .limit(2000)) as Row[];
      if (rows.length === 0) break;
      const staged = rows.map((r) => {
        const seq = Number(r.chain_seq);
        const prev = oldTail.get(r.chain_key) ?? { seq: 0, hash: GENESIS_HASH };
        const fields: HashedLedgerFields = {
          chainKey: r.chain_key,
          chainSeq: seq,
          prevHash: r.prev_hash,
          actorUserId: r.actor_user_id,
          actorRole: r.actor_role,
          occurredAt: r.occurred_at,
          action: r.action,
          entityType: r.entity_type,
          entityId: r.entity_id,
          patientId: r.patient_id,
          unitId: r.unit_id,
          beforeJson: r.before_json,
          afterJson: r.after_json,
          rationale: r.rationale,
        };
        if (seq !== prev.seq + 1 || r.prev_hash !== prev.hash || from(fields) !== r.hash) {
          throw new Error(
            `ledger row ${r.id} (chain ${r.chain_key}, row ${seq}) does not verify under the ${scheme} scheme; nothing was changed — investigate before migrating`,
          );
        }
        oldTail.set(r.chain_key, { seq, hash: r.hash });
        const prevHash = newTail.get(r.chain_key) ?? GENESIS_HASH;
        const hash = to({ ...fields, prevHash });
        newTail.set(r.chain_key, hash);
        return { id: r.id, prev_hash: prevHash, hash };
      });
      await knex("ledger_rehash").insert(staged);
      lastId = rows[rows.length - 1]!.id;
    }
    const heads = (await knex("ledger_chains").select("chain_key", "last_seq", "last_hash")) as {
      chain_key: string;
      last_seq: number | string;
      last_hash: string;
    }[];
    for (const h of heads) {
      const tail = oldTail.get(h.chain_key) ?? { seq: 0, hash: GENESIS_HASH };
      if (Number(h.last_seq) !== tail.seq || h.last_hash !== tail.hash) {
        throw new Error(
          `ledger chain head ${h.chain_key} does not match its last row; nothing was changed — investigate before migrating`,
        );
      }
    }
    // Rewrite: the append-only trigger is lifted only for this statement's span.
    await knex.raw("DROP TRIGGER IF EXISTS ledger_entries_no_update");
    try {
      await knex.raw(
        "UPDATE ledger_entries e JOIN ledger_rehash r ON r.id = e.id SET e.prev_hash = r.prev_hash, e.hash = r.hash",
      );
      await knex.raw(
        "UPDATE ledger_chains c JOIN ledger_entries e ON e.chain_key = c.chain_key AND e.chain_seq = c.last_seq SET c.last_hash = e.hash",
      );
    } finally {
      await knex.raw(NO_UPDATE_TRIGGER);
    }
  } finally {
    await knex.raw("DROP TEMPORARY TABLE IF EXISTS ledger_rehash");
  }
}

export async function up(knex: Knex): Promise<void> {
  const keys = deriveLedgerKeys(getEnv().LEDGER_HMAC_KEY);
  await rehash(knex, "unkeyed SHA-256", unkeyedLedgerHash, (f) => keyedLedgerHash(keys, f));
}

export async function down(knex: Knex): Promise<void> {
  const keys = deriveLedgerKeys(getEnv().LEDGER_HMAC_KEY);
  await rehash(knex, "keyed HMAC-SHA256", (f) => keyedLedgerHash(keys, f), unkeyedLedgerHash);
}

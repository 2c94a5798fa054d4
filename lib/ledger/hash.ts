import { createHash, createHmac, hash } from "node:crypto";

export const GENESIS_HASH = "0".repeat(64);

/** The fields a ledger hash covers, exactly as stored. */
export type HashedLedgerFields = {
  chainKey: string;
  chainSeq: number;
  prevHash: string;
  actorUserId: number | null;
  actorRole: string;
  occurredAt: Date;
  action: string;
  entityType: string;
  entityId: string;
  patientId: number | null;
  unitId: number | null;
  beforeJson: string | null;
  afterJson: string | null;
  rationale: string | null;
};

/**
 * The row's fields and the previous row's hash as a JSON array, so field
 * boundaries cannot be forged by crafted values. `occurredAtIso` is
 * `toISOString()` of the stored time.
 */
export function canonicalLedgerEntry(
  chainKey: string,
  chainSeq: number,
  prevHash: string,
  actorUserId: number | null,
  actorRole: string,
  occurredAtIso: string,
  action: string,
  entityType: string,
  entityId: string,
  patientId: number | null,
  unitId: number | null,
  beforeJson: string | null,
  afterJson: string | null,
  rationale: string | null,
): string {
  return JSON.stringify([
    chainKey,
    chainSeq,
    prevHash,
    actorUserId,
    actorRole,
    occurredAtIso,
    action,
    entityType,
    entityId,
    patientId,
    unitId,
    beforeJson,
    afterJson,
    rationale,
  ]);
}

function canonicalOf(f: HashedLedgerFields): string {
  return canonicalLedgerEntry(
    f.chainKey,
    f.chainSeq,
    f.prevHash,
    f.actorUserId,
    f.actorRole,
    f.occurredAt.toISOString(),
    f.action,
    f.entityType,
    f.entityId,
    f.patientId,
    f.unitId,
    f.beforeJson,
    f.afterJson,
    f.rationale,
  );
}

/**
 * The first scheme: plain SHA-256, no secret. Anyone who can INSERT can compute
 * it, so it no longer proves anything; kept to verify the rows being re-keyed by
 * the migration and to name a forged row for what it is.
 */
export function unkeyedLedgerHash(f: HashedLedgerFields): string {
  return createHash("sha256").update(canonicalOf(f)).digest("hex");
}

/**
 * The keys derived from the one ledger secret (LEDGER_HMAC_KEY), one per use so
 * an entry MAC can never be replayed as an anchor signature. Each is 64 hex
 * characters: exactly SHA-256's block size, so HMAC uses it as is.
 */
export type LedgerKeys = { entry: string; anchor: string };

export function deriveLedgerKeys(secret: string): LedgerKeys {
  const derive = (purpose: string) => createHmac("sha256", secret).update(purpose).digest("hex");
  return { entry: derive("tidemark ledger entry v1"), anchor: derive("tidemark ledger anchor v1") };
}

/** HMAC-SHA256 of one ledger row under the entry key (what `appendLedger` stores). */
export function keyedLedgerHash(keys: LedgerKeys, f: HashedLedgerFields): string {
  return createHmac("sha256", keys.entry).update(canonicalOf(f)).digest("hex");
}

/**
 * The same HMAC-SHA256 for the verifier's hot loop, about twice as fast as
 * `createHmac` per row: the key is 64 ASCII hex characters, so K⊕ipad is an
 * ASCII string that can be prefixed to the message and hashed in one call,
 * and the outer hash reuses one buffer holding K⊕opad.
 */
export function fastLedgerMac(entryKey: string): (canonical: string) => string {
  if (!/^[0-9a-f]{64}$/.test(entryKey)) throw new Error("entry key must be 64 hex characters");
  let inner = "";
  const outer = Buffer.alloc(96);
  for (let i = 0; i < 64; i++) {
    const c = entryKey.charCodeAt(i);
    inner += String.fromCharCode(c ^ 0x36);
    outer[i] = c ^ 0x5c;
  }
  return (canonical) => {
    hash("sha256", inner + canonical, "buffer").copy(outer, 64);
    return hash("sha256", outer, "hex");
  };
}

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
 * The same HMAC-SHA256 for the verifier's hot loop, about three times as fast
 * as `createHmac` per row. The key is 64 ASCII hex characters, exactly
 * SHA-256's block size, so K⊕ipad and K⊕opad are fixed 64-byte prefixes: the
 * row is UTF-8-encoded after K⊕ipad in one reused buffer, and the inner digest
 * is written after K⊕opad in another. The inner digest comes back as a
 * "binary" (latin1) string, one character per byte, because allocating a
 * Buffer per row cost more than both hashes.
 */
export function fastLedgerMac(entryKey: string): (canonical: string) => string {
  if (!/^[0-9a-f]{64}$/.test(entryKey)) throw new Error("entry key must be 64 hex characters");
  const inner = Buffer.alloc(16 * 1024);
  const outer = Buffer.alloc(96);
  for (let i = 0; i < 64; i++) {
    const c = entryKey.charCodeAt(i);
    inner[i] = c ^ 0x36;
    outer[i] = c ^ 0x5c;
  }
  // K⊕ipad is ASCII, so as a string prefix it encodes to the same 64 bytes.
  const ipad = inner.toString("latin1", 0, 64);
  // UTF-8 needs at most 3 bytes per UTF-16 code unit: longer rows take the string path.
  const fits = Math.floor((inner.length - 64) / 3);
  // One view per message length, made once, instead of a subarray per row.
  const views = new Array<Buffer | undefined>(inner.length + 1);
  return (canonical) => {
    let digest: string;
    if (canonical.length <= fits) {
      const n = 64 + inner.write(canonical, 64, "utf8");
      digest = hash("sha256", (views[n] ??= inner.subarray(0, n)), "binary");
    } else {
      digest = hash("sha256", ipad + canonical, "binary");
    }
    outer.write(digest, 64, "binary");
    return hash("sha256", outer, "hex");
  };
}

import { createHash } from "node:crypto";

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
 * SHA-256 over the row's fields and the previous row's hash, serialised as a
 * JSON array so field boundaries cannot be forged by crafted values.
 */
export function hashLedgerEntry(f: HashedLedgerFields): string {
  const canonical = JSON.stringify([
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
  ]);
  return createHash("sha256").update(canonical).digest("hex");
}

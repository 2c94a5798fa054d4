import path from "node:path";
import { getEnv } from "../env";
import { deriveLedgerKeys, type LedgerKeys } from "./hash";

let cached: { secret: string; keys: LedgerKeys } | undefined;

/** The ledger's keys, derived once from LEDGER_HMAC_KEY (which never enters the database). */
export function ledgerKeys(): LedgerKeys {
  const secret = getEnv().LEDGER_HMAC_KEY;
  if (cached?.secret !== secret) cached = { secret, keys: deriveLedgerKeys(secret) };
  return cached.keys;
}

/**
 * Where the signed chain-head anchor lives: LEDGER_ANCHOR_PATH, else one file
 * per database under .data, so a test or demo database is never compared with
 * another database's anchor.
 */
export function ledgerAnchorPath(): string {
  const env = getEnv();
  return path.resolve(
    env.LEDGER_ANCHOR_PATH ?? path.join(".data", `ledger-anchor.${env.DATABASE_NAME}.json`),
  );
}

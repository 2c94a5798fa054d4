import { readRoute } from "@/lib/boundary/next";
import { verifyLedgerOperation } from "@/lib/ledger/operations";

/**
 * `?mode=full|incremental`: `{ ok, checked, firstBroken, problems, mode, anchor }`.
 * Expensive: counted against the caller's per-minute quota.
 */
export const GET = readRoute(verifyLedgerOperation, {
  quota: "ledger_verify",
  respond: (result) => result,
});

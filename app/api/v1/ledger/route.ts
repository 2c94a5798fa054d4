import { readRoute } from "@/lib/boundary/next";
import { readLedgerOperation } from "@/lib/ledger/operations";

/** Ledger rows of the caller's units, newest first; filters and `before` cursor in the query. */
export const GET = readRoute(readLedgerOperation, { respond: (page) => page });

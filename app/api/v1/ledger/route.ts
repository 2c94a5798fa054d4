import { NextResponse } from "next/server";
import { requireRole } from "@/lib/auth/guard";
import { db } from "@/lib/db";
import { handleRoute } from "@/lib/http";
import { ledgerFilterSchema, listLedger } from "@/lib/ledger/queries";
import { parseInput } from "@/lib/validation";

/** Ledger rows of the caller's units, newest first; filters and `before` cursor in the query. */
export function GET(request: Request) {
  return handleRoute(async () => {
    const actor = await requireRole();
    const filter = parseInput(ledgerFilterSchema, Object.fromEntries(new URL(request.url).searchParams));
    return NextResponse.json(await listLedger(db(), actor, filter));
  });
}

import { NextResponse } from "next/server";
import { requireRole } from "@/lib/auth/guard";
import { db } from "@/lib/db";
import { handleRoute } from "@/lib/http";
import { verifyLedger } from "@/lib/ledger/verify";

/** Walks every hash chain: `{ ok, checked, firstBroken }`. */
export function GET() {
  return handleRoute(async () => {
    await requireRole();
    return NextResponse.json(await verifyLedger(db()));
  });
}

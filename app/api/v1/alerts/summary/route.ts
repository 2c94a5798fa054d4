import { NextResponse } from "next/server";
import { alertSummary } from "@/lib/alerts/queries";
import { requireRole } from "@/lib/auth/guard";
import { db } from "@/lib/db";
import { handleRoute } from "@/lib/http";

/** The header badge: counts of unresolved alerts on the caller's units. */
export function GET() {
  return handleRoute(async () => {
    const actor = await requireRole();
    return NextResponse.json(await alertSummary(db(), actor), {
      headers: { "Cache-Control": "no-store" },
    });
  });
}

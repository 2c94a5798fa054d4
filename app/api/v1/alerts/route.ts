import { NextResponse } from "next/server";
import { listAlerts } from "@/lib/alerts/queries";
import { requireRole } from "@/lib/auth/guard";
import { db } from "@/lib/db";
import { handleRoute } from "@/lib/http";

/**
 * Alerts on the caller's units. Filters: `status` (open — the default —,
 * unacknowledged, resolved, all), `kind`, `unitId`, `patientId`, `limit`.
 */
export function GET(request: Request) {
  return handleRoute(async () => {
    const actor = await requireRole();
    const query = Object.fromEntries(new URL(request.url).searchParams);
    return NextResponse.json(
      { alerts: await listAlerts(db(), actor, query) },
      { headers: { "Cache-Control": "no-store" } },
    );
  });
}

import { NextResponse } from "next/server";
import type { ResolveInput } from "@/lib/alerts/schema";
import { resolveAlert } from "@/lib/alerts/service";
import { requirePermission } from "@/lib/auth/guard";
import { db } from "@/lib/db";
import { handleRoute, idParam, readJson } from "@/lib/http";
import { parseInput } from "@/lib/validation";

/** Close an alert by hand: `{ reason }` (required). */
export function POST(request: Request, { params }: { params: Promise<{ alertId: string }> }) {
  return handleRoute(async () => {
    const actor = await requirePermission("alert.act");
    const { alertId } = parseInput(idParam("alertId"), await params) as { alertId: number };
    const body = await readJson(request);
    return NextResponse.json({
      alert: await resolveAlert(db(), actor, { ...(body as object), alertId } as ResolveInput),
    });
  });
}

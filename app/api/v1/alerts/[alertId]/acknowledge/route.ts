import { NextResponse } from "next/server";
import type { AcknowledgeInput } from "@/lib/alerts/schema";
import { acknowledgeAlert } from "@/lib/alerts/service";
import { requirePermission } from "@/lib/auth/guard";
import { db } from "@/lib/db";
import { handleRoute, idParam, readJson } from "@/lib/http";
import { parseInput } from "@/lib/validation";

/** Acknowledge an alert: `{ note? }`. Escalation stops; a second acknowledgement is a 409. */
export function POST(request: Request, { params }: { params: Promise<{ alertId: string }> }) {
  return handleRoute(async () => {
    const actor = await requirePermission("alert.act");
    const { alertId } = parseInput(idParam("alertId"), await params) as { alertId: number };
    const text = await request.clone().text();
    const body = text.trim() ? await readJson(request) : {};
    return NextResponse.json({
      alert: await acknowledgeAlert(db(), actor, {
        ...(body as object),
        alertId,
      } as AcknowledgeInput),
    });
  });
}

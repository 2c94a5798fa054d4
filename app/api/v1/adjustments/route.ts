import { NextResponse } from "next/server";
import type { AdjustmentInput } from "@/lib/adjustments/schema";
import { recordAdjustment } from "@/lib/adjustments/service";
import { requirePermission } from "@/lib/auth/guard";
import { db } from "@/lib/db";
import { handleRoute, readWriteBody } from "@/lib/http";

/** Records an applied settings change within the order in effect. */
export function POST(request: Request) {
  return handleRoute(async () => {
    const actor = await requirePermission("adjustment.record");
    const adjustment = await recordAdjustment(db(), actor, (await readWriteBody(request)) as AdjustmentInput);
    return NextResponse.json({ adjustment }, { status: 201 });
  });
}

import { NextResponse } from "next/server";
import { z } from "zod";
import { requireRole } from "@/lib/auth/guard";
import { assertUnitAccess } from "@/lib/auth/actor-queries";
import { db } from "@/lib/db";
import { NotFoundError } from "@/lib/errors";
import { handleRoute, idParam } from "@/lib/http";
import { getOrder } from "@/lib/orders/queries";
import { HISTORY_RANGE, parseInput, queryTime } from "@/lib/validation";

const query = z.object({ asOf: queryTime("asOf", HISTORY_RANGE).optional() });

/** An order as it stands, or as it stood at `?asOf=` (system-versioned history). */
export function GET(request: Request, { params }: { params: Promise<{ orderId: string }> }) {
  return handleRoute(async () => {
    const actor = await requireRole();
    const { orderId } = parseInput(idParam("orderId"), await params) as { orderId: number };
    const { asOf } = parseInput(query, Object.fromEntries(new URL(request.url).searchParams));
    const order = await getOrder(db(), orderId, asOf);
    if (!order) throw new NotFoundError("No order with that id at that time.");
    assertUnitAccess(actor, order.unitId);
    return NextResponse.json({ order, asOf: asOf?.toISOString() ?? null });
  });
}

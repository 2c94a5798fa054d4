import { NextResponse } from "next/server";
import { requirePermission } from "@/lib/auth/guard";
import { db } from "@/lib/db";
import { handleRoute, idParam, readWriteBody } from "@/lib/http";
import { discontinueOrder } from "@/lib/orders/service";
import type { DiscontinueInput } from "@/lib/orders/schema";
import { parseInput } from "@/lib/validation";

/** A physician discontinues an order: `{ version, reason, password }`. */
export function POST(request: Request, { params }: { params: Promise<{ orderId: string }> }) {
  return handleRoute(async () => {
    const actor = await requirePermission("order.discontinue");
    const { orderId } = parseInput(idParam("orderId"), await params) as { orderId: number };
    const body = await readWriteBody(request);
    return NextResponse.json({ order: await discontinueOrder(db(), actor, { ...body, orderId } as DiscontinueInput) });
  });
}

import { NextResponse } from "next/server";
import { requirePermission } from "@/lib/auth/guard";
import { db } from "@/lib/db";
import { handleRoute, idParam, readWriteBody } from "@/lib/http";
import { cosignOrder } from "@/lib/orders/service";
import type { CosignInput } from "@/lib/orders/schema";
import { parseInput } from "@/lib/validation";

/** A physician co-signs a verbal or telephone order: `{ version, password }`. */
export function POST(request: Request, { params }: { params: Promise<{ orderId: string }> }) {
  return handleRoute(async () => {
    const actor = await requirePermission("order.cosign");
    const { orderId } = parseInput(idParam("orderId"), await params) as { orderId: number };
    const body = await readWriteBody(request);
    return NextResponse.json({ order: await cosignOrder(db(), actor, { ...body, orderId } as CosignInput) });
  });
}

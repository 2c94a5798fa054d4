import { NextResponse } from "next/server";
import { requirePermission } from "@/lib/auth/guard";
import { db } from "@/lib/db";
import { handleRoute, readWriteBody } from "@/lib/http";
import { writeOrder } from "@/lib/orders/service";
import type { OrderInput } from "@/lib/orders/schema";

/** Writes an order: a physician's signed order, or a nurse's/therapist's verbal order. */
export function POST(request: Request) {
  return handleRoute(async () => {
    const actor = await requirePermission("order.write");
    const order = await writeOrder(db(), actor, (await readWriteBody(request)) as OrderInput);
    return NextResponse.json({ order }, { status: 201 });
  });
}

"use server";

import { revalidatePath } from "next/cache";
import { runAction, type ActionResult } from "@/lib/action-result";
import { requirePermission } from "@/lib/auth/guard";
import { db } from "@/lib/db";
import type { OrderView } from "@/lib/orders/queries";
import { cosignSchema, discontinueSchema, orderInputSchema } from "@/lib/orders/schema";
import { cosignOrder, discontinueOrder, writeOrder } from "@/lib/orders/service";
import { parseInput } from "@/lib/validation";

// Each action: session and role → shared schema → service (order + ledger row in
// one transaction) → revalidate. An action is a public POST endpoint, so the
// guard runs here even though the pages are guarded too. The service checks the
// role and the patient's unit once more.

function revalidateOrder(order: OrderView): void {
  revalidatePath(`/patients/${order.patientId}`);
  revalidatePath(`/orders/${order.id}`);
  revalidatePath("/orders/cosign");
  revalidatePath("/board");
}

/** A physician's signed order, or a nurse's/therapist's verbal or telephone order. */
export async function writeOrderAction(input: unknown): Promise<ActionResult<OrderView>> {
  return runAction(async () => {
    const actor = await requirePermission("order.write");
    const parsed = parseInput(orderInputSchema, input);
    const order = await writeOrder(db(), actor, parsed);
    revalidateOrder(order);
    revalidatePath(`/patients/${order.patientId}/orders/new`);
    // The order it replaced now reads "superseded".
    if (parsed.supersedesOrderId !== null) revalidatePath(`/orders/${parsed.supersedesOrderId}`);
    return order;
  });
}

/** A physician co-signs a verbal or telephone order with their password. */
export async function cosignOrderAction(input: unknown): Promise<ActionResult<OrderView>> {
  return runAction(async () => {
    const actor = await requirePermission("order.cosign");
    const order = await cosignOrder(db(), actor, parseInput(cosignSchema, input));
    revalidateOrder(order);
    return order;
  });
}

/** A physician discontinues the order in effect, with a reason and their password. */
export async function discontinueOrderAction(input: unknown): Promise<ActionResult<OrderView>> {
  return runAction(async () => {
    const actor = await requirePermission("order.discontinue");
    const order = await discontinueOrder(db(), actor, parseInput(discontinueSchema, input));
    revalidateOrder(order);
    return order;
  });
}

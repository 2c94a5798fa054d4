"use server";

import type { ActionResult } from "../action-result";
import { runWriteAction, type Revalidation } from "../boundary/next";
import { cosignOrderOperation, discontinueOrderOperation, writeOrderOperation } from "./operations";
import type { OrderView } from "./queries";

// Server actions for the order screens; each is one operation of
// lib/orders/operations.ts, refreshing the pages the order shows on.

function orderPages(order: OrderView): Revalidation[] {
  return [`/patients/${order.patientId}`, `/orders/${order.id}`, "/orders/cosign", "/board"];
}

/** A physician's signed order, or a nurse's/therapist's verbal or telephone order. */
export async function writeOrderAction(input: unknown): Promise<ActionResult<OrderView>> {
  return runWriteAction(writeOrderOperation, input, (order, parsed) => [
    ...orderPages(order),
    `/patients/${order.patientId}/orders/new`,
    // The order it replaced now reads "superseded".
    ...(parsed.supersedesOrderId !== null ? [`/orders/${parsed.supersedesOrderId}`] : []),
  ]);
}

export async function cosignOrderAction(input: unknown): Promise<ActionResult<OrderView>> {
  return runWriteAction(cosignOrderOperation, input, orderPages);
}

export async function discontinueOrderAction(input: unknown): Promise<ActionResult<OrderView>> {
  return runWriteAction(discontinueOrderOperation, input, orderPages);
}

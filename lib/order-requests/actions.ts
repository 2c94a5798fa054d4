"use server";

import type { ActionResult } from "../action-result";
import { runWriteAction } from "../boundary/next";
import { replyOrderRequestOperation, sendOrderRequestOperation } from "./operations";
import type { OrderRequestView } from "./queries";

// The request shows on the queue, the Board's panel and the patient's Chart.

export async function sendOrderRequestAction(
  input: unknown,
): Promise<ActionResult<OrderRequestView>> {
  return runWriteAction(sendOrderRequestOperation, input, (r) => [
    "/order-requests",
    "/board",
    `/patients/${r.patientId}`,
  ]);
}

export async function replyOrderRequestAction(
  input: unknown,
): Promise<ActionResult<OrderRequestView>> {
  return runWriteAction(replyOrderRequestOperation, input, (r) => [
    "/order-requests",
    "/board",
    `/patients/${r.patientId}`,
  ]);
}

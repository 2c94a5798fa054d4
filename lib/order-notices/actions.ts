"use server";

import type { ActionResult } from "../action-result";
import { runWriteAction } from "../boundary/next";
import { readOrderChangeOperation } from "./operations";
import type { OrderReadResult } from "./service";

export async function readOrderChangeAction(
  input: unknown,
): Promise<ActionResult<OrderReadResult>> {
  return runWriteAction(readOrderChangeOperation, input, (r) => [
    "/board",
    "/assignments/mine",
    `/orders/${r.orderId}`,
  ]);
}

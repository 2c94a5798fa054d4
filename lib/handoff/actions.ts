"use server";

import type { ActionResult } from "../action-result";
import { runWriteAction } from "../boundary/next";
import { acknowledgeHandoffOperation } from "./operations";
import type { HandoffAcknowledgeResult } from "./service";

export async function acknowledgeHandoffAction(
  input: unknown,
): Promise<ActionResult<HandoffAcknowledgeResult>> {
  return runWriteAction(acknowledgeHandoffOperation, input, () => ["/handoff"]);
}

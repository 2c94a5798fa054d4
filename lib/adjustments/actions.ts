"use server";

import type { ActionResult } from "../action-result";
import { runWriteAction } from "../boundary/next";
import { recordAdjustmentOperation } from "./operations";
import type { AdjustmentView } from "./service";

/** Server action for the bedside settings-change form (lib/adjustments/operations.ts). */
export async function recordAdjustmentAction(
  input: unknown,
): Promise<ActionResult<AdjustmentView>> {
  return runWriteAction(recordAdjustmentOperation, input, (adjustment) => [
    `/patients/${adjustment.patientId}`,
    "/board",
  ]);
}

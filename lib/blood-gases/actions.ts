"use server";

import type { ActionResult } from "../action-result";
import { runWriteAction } from "../boundary/next";
import { recordBloodGasOperation } from "./operations";
import type { BloodGasView } from "./service";

/** Server action for the bedside blood gas form (lib/blood-gases/operations.ts). */
export async function recordBloodGasAction(input: unknown): Promise<ActionResult<BloodGasView>> {
  return runWriteAction(recordBloodGasOperation, input, (gas) => [
    `/patients/${gas.patientId}`,
    "/board",
  ]);
}

"use server";

import type { ActionResult } from "../action-result";
import { runWriteAction } from "../boundary/next";
import { chartReadingOperation } from "./operations";
import type { ReadingView } from "./service";

/** Server action for the bedside reading form (lib/readings/operations.ts). */
export async function chartReadingAction(input: unknown): Promise<ActionResult<ReadingView>> {
  return runWriteAction(chartReadingOperation, input, (reading) => [
    `/patients/${reading.patientId}`,
    "/board",
  ]);
}

"use server";

import type { ActionResult } from "../action-result";
import { runWriteAction } from "../boundary/next";
import { recordVentilatorCheckOperation } from "./operations";
import type { VentilatorCheckView } from "./queries";

/** Server action for the ventilator check form (lib/ventilator-checks/operations.ts). */
export async function recordVentilatorCheckAction(
  input: unknown,
): Promise<ActionResult<VentilatorCheckView>> {
  return runWriteAction(recordVentilatorCheckOperation, input, (check) => [
    `/patients/${check.patientId}`,
    "/board",
    "/alerts",
  ]);
}

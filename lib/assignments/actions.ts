"use server";

import type { ActionResult } from "../action-result";
import { runWriteAction } from "../boundary/next";
import { setAssignmentsOperation } from "./operations";
import type { AssignmentWriteResult } from "./service";

export async function setAssignmentsAction(
  input: unknown,
): Promise<ActionResult<AssignmentWriteResult>> {
  return runWriteAction(setAssignmentsOperation, input, () => [
    "/assignments",
    "/assignments/mine",
    "/board",
  ]);
}

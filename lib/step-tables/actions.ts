"use server";

import type { ActionResult } from "../action-result";
import { runWriteAction } from "../boundary/next";
import {
  createStepTableOperation,
  setStepTableActiveOperation,
  updateStepTableOperation,
} from "./operations";
import type { StepTableView } from "./queries";

const stepTablePages = () => ["/admin/step-tables"];

export async function createStepTableAction(input: unknown): Promise<ActionResult<StepTableView>> {
  return runWriteAction(createStepTableOperation, input, stepTablePages);
}

export async function updateStepTableAction(input: unknown): Promise<ActionResult<StepTableView>> {
  return runWriteAction(updateStepTableOperation, input, stepTablePages);
}

export async function setStepTableActiveAction(
  input: unknown,
): Promise<ActionResult<StepTableView>> {
  return runWriteAction(setStepTableActiveOperation, input, stepTablePages);
}

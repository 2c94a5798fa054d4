"use server";

import type { ActionResult } from "../action-result";
import { runWriteAction, type Revalidation } from "../boundary/next";
import type { AlertStepResult } from "./clinician-steps";
import {
  acknowledgeAlertOperation,
  resolveAlertOperation,
  saveEmailPreferencesOperation,
} from "./operations";
import type { EmailPreferences } from "./schema";

// The Board and Charts show alert counts, so they refresh with the alert list.
const alertPages = (): Revalidation[] => ["/alerts", "/board", ["/patients/[patientId]", "page"]];

export async function acknowledgeAlertAction(
  input: unknown,
): Promise<ActionResult<AlertStepResult>> {
  return runWriteAction(acknowledgeAlertOperation, input, alertPages);
}

export async function resolveAlertAction(input: unknown): Promise<ActionResult<AlertStepResult>> {
  return runWriteAction(resolveAlertOperation, input, alertPages);
}

export async function saveEmailPreferencesAction(
  input: unknown,
): Promise<ActionResult<EmailPreferences>> {
  return runWriteAction(saveEmailPreferencesOperation, input, () => ["/alerts"]);
}

"use server";

import { revalidatePath } from "next/cache";
import { runAction, type ActionResult } from "@/lib/action-result";
import { setEmailPreferences } from "@/lib/alerts/queries";
import {
  acknowledgeSchema,
  emailPreferencesSchema,
  resolveSchema,
  type EmailPreferences,
} from "@/lib/alerts/schema";
import { acknowledgeAlert, resolveAlert, type AlertStepResult } from "@/lib/alerts/service";
import { requireRole, requirePermission } from "@/lib/auth/guard";
import { db } from "@/lib/db";
import { parseInput } from "@/lib/validation";

// Guard first, shared schema, then the service (alert row + ledger row in one
// transaction); the Board and Charts show alert counts, so they revalidate too.

function revalidateAlerts(): void {
  revalidatePath("/alerts");
  revalidatePath("/board");
  revalidatePath("/patients/[patientId]", "page");
}

export async function acknowledgeAlertAction(
  input: unknown,
): Promise<ActionResult<AlertStepResult>> {
  return runAction(async () => {
    const actor = await requirePermission("alert.act");
    const result = await acknowledgeAlert(db(), actor, parseInput(acknowledgeSchema, input));
    revalidateAlerts();
    return result;
  });
}

export async function resolveAlertAction(input: unknown): Promise<ActionResult<AlertStepResult>> {
  return runAction(async () => {
    const actor = await requirePermission("alert.act");
    const result = await resolveAlert(db(), actor, parseInput(resolveSchema, input));
    revalidateAlerts();
    return result;
  });
}

/** The signed-in user's own e-mail choices per alert kind. */
export async function saveEmailPreferencesAction(
  input: unknown,
): Promise<ActionResult<EmailPreferences>> {
  return runAction(async () => {
    const actor = await requireRole();
    const prefs = await setEmailPreferences(db(), actor, parseInput(emailPreferencesSchema, input));
    revalidatePath("/alerts");
    return prefs;
  });
}

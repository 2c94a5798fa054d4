"use server";

import { revalidatePath } from "next/cache";
import { runAction, type ActionResult } from "@/lib/action-result";
import { adjustmentSchema } from "@/lib/adjustments/schema";
import { recordAdjustment, type AdjustmentView } from "@/lib/adjustments/service";
import { requirePermission } from "@/lib/auth/guard";
import { bloodGasSchema } from "@/lib/blood-gases/schema";
import { recordBloodGas, type BloodGasView } from "@/lib/blood-gases/service";
import { db } from "@/lib/db";
import { readingSchema } from "@/lib/readings/schema";
import { chartReading, type ReadingView } from "@/lib/readings/service";
import { parseInput } from "@/lib/validation";

// The bedside writes. Each action: session and role → shared schema → service
// (which checks the role and the unit again, and writes the change with its
// ledger row in one transaction) → revalidate the Chart and the Board. An
// action is a public POST endpoint, so the guard runs here even though the
// pages are guarded too.

function revalidatePatient(patientId: number): void {
  revalidatePath(`/patients/${patientId}`);
  revalidatePath("/board");
}

/** One applied settings change within the order in effect (nurses: low-flow devices only). */
export async function recordAdjustmentAction(
  input: unknown,
): Promise<ActionResult<AdjustmentView>> {
  return runAction(async () => {
    const actor = await requirePermission("adjustment.record");
    const adjustment = await recordAdjustment(db(), actor, parseInput(adjustmentSchema, input));
    revalidatePatient(adjustment.patientId);
    return adjustment;
  });
}

/** One charted reading: SpO2 with the device and oxygen in use. */
export async function chartReadingAction(input: unknown): Promise<ActionResult<ReadingView>> {
  return runAction(async () => {
    const actor = await requirePermission("reading.chart");
    const reading = await chartReading(db(), actor, parseInput(readingSchema, input));
    revalidatePatient(reading.patientId);
    return reading;
  });
}

/** One blood gas (mmHg, g/dL), with its computed indices for an arterial sample. */
export async function recordBloodGasAction(input: unknown): Promise<ActionResult<BloodGasView>> {
  return runAction(async () => {
    const actor = await requirePermission("blood_gas.record");
    const gas = await recordBloodGas(db(), actor, parseInput(bloodGasSchema, input));
    revalidatePatient(gas.patientId);
    return gas;
  });
}

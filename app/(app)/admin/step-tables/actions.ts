"use server";

import { revalidatePath } from "next/cache";
import { runAction, type ActionResult } from "@/lib/action-result";
import { requirePermission } from "@/lib/auth/guard";
import { db } from "@/lib/db";
import type { StepTableView } from "@/lib/step-tables/queries";
import {
  stepTableActiveSchema,
  stepTableCreateSchema,
  stepTableUpdateSchema,
} from "@/lib/step-tables/schema";
import { createStepTable, setStepTableActive, updateStepTable } from "@/lib/step-tables/service";
import { parseInput } from "@/lib/validation";

export async function createStepTableAction(input: unknown): Promise<ActionResult<StepTableView>> {
  return runAction(async () => {
    const actor = await requirePermission("step_table.manage");
    const table = await createStepTable(db(), actor, parseInput(stepTableCreateSchema, input));
    revalidatePath("/admin/step-tables");
    return table;
  });
}

export async function updateStepTableAction(input: unknown): Promise<ActionResult<StepTableView>> {
  return runAction(async () => {
    const actor = await requirePermission("step_table.manage");
    const table = await updateStepTable(db(), actor, parseInput(stepTableUpdateSchema, input));
    revalidatePath("/admin/step-tables");
    return table;
  });
}

export async function setStepTableActiveAction(
  input: unknown,
): Promise<ActionResult<StepTableView>> {
  return runAction(async () => {
    const actor = await requirePermission("step_table.manage");
    const table = await setStepTableActive(db(), actor, parseInput(stepTableActiveSchema, input));
    revalidatePath("/admin/step-tables");
    return table;
  });
}

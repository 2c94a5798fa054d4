"use server";

import { revalidatePath } from "next/cache";
import { runAction, type ActionResult } from "@/lib/action-result";
import { requirePermission } from "@/lib/auth/guard";
import { db } from "@/lib/db";
import type { UserSummary } from "@/lib/users/queries";
import { createUser, setUserActive, updateUser } from "@/lib/users/service";
import { userActiveSchema, userCreateSchema, userUpdateSchema } from "@/lib/users/schema";
import { parseInput } from "@/lib/validation";

// Each action: session and role → shared schema → service (change + ledger row
// in one transaction) → revalidate. An action is a public POST endpoint, so the
// guard runs here even though the pages are guarded too.

export async function createUserAction(input: unknown): Promise<ActionResult<UserSummary>> {
  return runAction(async () => {
    const actor = await requirePermission("user.manage");
    const user = await createUser(db(), actor, parseInput(userCreateSchema, input));
    revalidatePath("/admin/users");
    return user;
  });
}

export async function updateUserAction(input: unknown): Promise<ActionResult<UserSummary>> {
  return runAction(async () => {
    const actor = await requirePermission("user.manage");
    const user = await updateUser(db(), actor, parseInput(userUpdateSchema, input));
    revalidatePath("/admin/users");
    return user;
  });
}

export async function setUserActiveAction(input: unknown): Promise<ActionResult<UserSummary>> {
  return runAction(async () => {
    const actor = await requirePermission("user.manage");
    const user = await setUserActive(db(), actor, parseInput(userActiveSchema, input));
    revalidatePath("/admin/users");
    return user;
  });
}

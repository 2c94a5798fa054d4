"use server";

import { revalidatePath } from "next/cache";
import { runAction, type ActionResult } from "@/lib/action-result";
import type { ApiTokenSummary } from "@/lib/api-tokens/queries";
import { apiTokenCreateSchema, apiTokenRevokeSchema } from "@/lib/api-tokens/schema";
import { createApiToken, revokeApiToken } from "@/lib/api-tokens/service";
import { requirePermission } from "@/lib/auth/guard";
import { db } from "@/lib/db";
import { parseInput } from "@/lib/validation";

// Session and role → shared schema → service (change + ledger row in one
// transaction) → revalidate. The token itself is answered once, here, and
// never again: only its hash is stored.

export async function createApiTokenAction(
  input: unknown,
): Promise<ActionResult<{ token: string; summary: ApiTokenSummary }>> {
  return runAction(async () => {
    const actor = await requirePermission("api_token.manage");
    const created = await createApiToken(db(), actor, parseInput(apiTokenCreateSchema, input));
    revalidatePath("/admin/api-tokens");
    return created;
  });
}

export async function revokeApiTokenAction(input: unknown): Promise<ActionResult<ApiTokenSummary>> {
  return runAction(async () => {
    const actor = await requirePermission("api_token.manage");
    const revoked = await revokeApiToken(db(), actor, parseInput(apiTokenRevokeSchema, input));
    revalidatePath("/admin/api-tokens");
    return revoked;
  });
}

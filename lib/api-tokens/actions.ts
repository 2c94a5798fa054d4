"use server";

import type { ActionResult } from "../action-result";
import { runWriteAction } from "../boundary/next";
import { createApiTokenOperation, revokeApiTokenOperation } from "./operations";
import type { ApiTokenSummary } from "./queries";

const tokenPages = () => ["/admin/api-tokens"];

export async function createApiTokenAction(
  input: unknown,
): Promise<ActionResult<{ token: string; summary: ApiTokenSummary }>> {
  return runWriteAction(createApiTokenOperation, input, tokenPages);
}

export async function revokeApiTokenAction(input: unknown): Promise<ActionResult<ApiTokenSummary>> {
  return runWriteAction(revokeApiTokenOperation, input, tokenPages);
}

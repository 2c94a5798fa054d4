"use server";

import type { ActionResult } from "../action-result";
import { runWriteAction } from "../boundary/next";
import { createUserOperation, setUserActiveOperation, updateUserOperation } from "./operations";
import type { UserSummary } from "./queries";

const userPages = () => ["/admin/users"];

export async function createUserAction(input: unknown): Promise<ActionResult<UserSummary>> {
  return runWriteAction(createUserOperation, input, userPages);
}

export async function updateUserAction(input: unknown): Promise<ActionResult<UserSummary>> {
  return runWriteAction(updateUserOperation, input, userPages);
}

export async function setUserActiveAction(input: unknown): Promise<ActionResult<UserSummary>> {
  return runWriteAction(setUserActiveOperation, input, userPages);
}

"use server";

import type { ActionResult } from "../action-result";
import { runWriteAction } from "../boundary/next";
import { changePasswordOperation, inviteUserOperation } from "./operations";
import type { InvitationSent } from "./service";

export async function inviteUserAction(input: unknown): Promise<ActionResult<InvitationSent>> {
  return runWriteAction(inviteUserOperation, input, (r) => [
    "/admin/users",
    `/admin/users/${r.userId}`,
  ]);
}

export async function changePasswordAction(
  input: unknown,
): Promise<ActionResult<{ changed: true }>> {
  return runWriteAction(changePasswordOperation, input);
}

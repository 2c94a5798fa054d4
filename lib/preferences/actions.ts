"use server";

import { revalidatePath } from "next/cache";
import { cookies } from "next/headers";
import { runAction, type ActionResult } from "../action-result";
import { requirePermission } from "../auth/guard";
import { NotFoundError } from "../errors";
import { parseInput } from "../validation";
import { UNIT_COOKIE, unitChoiceSchema } from "./unit";

/**
 * Switches the unit the Board and lists show; only units the user is assigned
 * to. A cookie, not a database row, so it is not an operation of its own.
 */
export async function selectUnitAction(value: unknown): Promise<ActionResult<{ unit: string }>> {
  return runAction(async () => {
    const actor = await requirePermission("account.self");
    const choice = parseInput(unitChoiceSchema, value);
    if (choice !== "all" && !actor.unitIds.includes(choice))
      throw new NotFoundError("Unknown unit.");
    (await cookies()).set(UNIT_COOKIE, String(choice), {
      path: "/",
      sameSite: "lax",
      httpOnly: true,
      maxAge: 60 * 60 * 24 * 30,
    });
    revalidatePath("/", "layout");
    return { unit: String(choice) };
  });
}

"use server";

import { cookies } from "next/headers";
import { revalidatePath } from "next/cache";
import { runAction, type ActionResult } from "@/lib/action-result";
import { requireRole } from "@/lib/auth/guard";
import { NotFoundError } from "@/lib/errors";
import { UNIT_COOKIE, unitChoiceSchema } from "@/lib/preferences/unit";
import { parseInput } from "@/lib/validation";

/** Switches the unit the Board and lists show; only units the user is assigned to. */
export async function selectUnitAction(value: unknown): Promise<ActionResult<{ unit: string }>> {
  return runAction(async () => {
    const actor = await requireRole();
    const choice = parseInput(unitChoiceSchema, value);
    if (choice !== "all" && !actor.unitIds.includes(choice)) throw new NotFoundError("Unknown unit.");
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

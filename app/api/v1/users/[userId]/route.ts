import { NextResponse } from "next/server";
import { z } from "zod";
import { requirePermission } from "@/lib/auth/guard";
import { db } from "@/lib/db";
import { NotFoundError } from "@/lib/errors";
import { handleRoute, readJson } from "@/lib/http";
import { getUser } from "@/lib/users/queries";
import { updateUser } from "@/lib/users/service";
import { userUpdateSchema } from "@/lib/users/schema";
import { parseInput } from "@/lib/validation";

const paramsSchema = z.object({ userId: z.coerce.number().int().positive("userId must be a positive whole number.") });
type Ctx = { params: Promise<{ userId: string }> };

export function GET(_request: Request, { params }: Ctx) {
  return handleRoute(async () => {
    await requirePermission("user.manage");
    const { userId } = parseInput(paramsSchema, await params);
    const user = await getUser(db(), userId);
    if (!user) throw new NotFoundError("That user does not exist.");
    return NextResponse.json({ user });
  });
}

/** Full update; the body names the version it was based on (409 if stale). */
export function PATCH(request: Request, { params }: Ctx) {
  return handleRoute(async () => {
    const actor = await requirePermission("user.manage");
    const { userId } = parseInput(paramsSchema, await params);
    const body = await readJson(request);
    const input = parseInput(userUpdateSchema, { ...(body as object), id: userId });
    return NextResponse.json({ user: await updateUser(db(), actor, input) });
  });
}

import { NextResponse } from "next/server";
import { z } from "zod";
import { requirePermission } from "@/lib/auth/guard";
import { db } from "@/lib/db";
import { handleRoute, readJson } from "@/lib/http";
import { setUserActive } from "@/lib/users/service";
import { userActiveSchema } from "@/lib/users/schema";
import { parseInput } from "@/lib/validation";

const paramsSchema = z.object({ userId: z.coerce.number().int().positive() });

/** Deactivate or reactivate: `{ version, active, rationale }`. */
export function POST(request: Request, { params }: { params: Promise<{ userId: string }> }) {
  return handleRoute(async () => {
    const actor = await requirePermission("user.manage");
    const { userId } = parseInput(paramsSchema, await params);
    const body = await readJson(request);
    const input = parseInput(userActiveSchema, { ...(body as object), id: userId });
    return NextResponse.json({ user: await setUserActive(db(), actor, input) });
  });
}

import { NextResponse } from "next/server";
import { requirePermission } from "@/lib/auth/guard";
import { db } from "@/lib/db";
import { handleRoute, readJson } from "@/lib/http";
import { listUsers } from "@/lib/users/queries";
import { createUser } from "@/lib/users/service";
import { userCreateSchema } from "@/lib/users/schema";
import { parseInput } from "@/lib/validation";

export function GET() {
  return handleRoute(async () => {
    await requirePermission("user.manage");
    return NextResponse.json({ users: await listUsers(db()) });
  });
}

export function POST(request: Request) {
  return handleRoute(async () => {
    const actor = await requirePermission("user.manage");
    const input = parseInput(userCreateSchema, await readJson(request));
    const user = await createUser(db(), actor, input);
    return NextResponse.json({ user }, { status: 201 });
  });
}

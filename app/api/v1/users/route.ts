import { NextResponse } from "next/server";
import { requireRole } from "@/lib/auth/guard";
import { db } from "@/lib/db";
import { handleRoute, readJson } from "@/lib/http";
import { listUsers } from "@/lib/users/queries";
import { createUser } from "@/lib/users/service";
import { userCreateSchema } from "@/lib/users/schema";
import { parseInput } from "@/lib/validation";

export function GET() {
  return handleRoute(async () => {
    await requireRole("admin");
    return NextResponse.json({ users: await listUsers(db()) });
  });
}

export function POST(request: Request) {
  return handleRoute(async () => {
    const actor = await requireRole("admin");
    const input = parseInput(userCreateSchema, await readJson(request));
    const user = await createUser(db(), actor, input);
    return NextResponse.json({ user }, { status: 201 });
  });
}

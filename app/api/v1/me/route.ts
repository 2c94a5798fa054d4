import { NextResponse } from "next/server";
import { requirePermission } from "@/lib/auth/guard";
import { handleRoute } from "@/lib/http";

/** The signed-in user as the server sees them (role and units). */
export function GET() {
  return handleRoute(async () =>
    NextResponse.json({ user: await requirePermission("account.self") }),
  );
}

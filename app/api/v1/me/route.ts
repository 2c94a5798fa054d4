import { NextResponse } from "next/server";
import { requireRole } from "@/lib/auth/guard";
import { handleRoute } from "@/lib/http";

/** The signed-in user as the server sees them (role and units). */
export function GET() {
  return handleRoute(async () => NextResponse.json({ user: await requireRole() }));
}

import { NextResponse } from "next/server";
import { requireRole } from "@/lib/auth/guard";
import { db } from "@/lib/db";
import { handleRoute } from "@/lib/http";
import { listStepTables } from "@/lib/step-tables/queries";

/** The step-table library of the caller's units: published tables and the units' own. */
export function GET() {
  return handleRoute(async () => {
    const actor = await requireRole();
    return NextResponse.json({ stepTables: await listStepTables(db(), actor.unitIds) });
  });
}

import { NextResponse } from "next/server";
import { z } from "zod";
import { assertUnitAccess } from "@/lib/auth/actor-queries";
import { requireRole } from "@/lib/auth/guard";
import { listOccupiedBeds, summariseUnits } from "@/lib/board/queries";
import { db } from "@/lib/db";
import { handleRoute } from "@/lib/http";
import { parseInput } from "@/lib/validation";

const querySchema = z.object({ unitId: z.coerce.number().int().positive().optional() });

/** Occupied beds of the caller's units (or one of them with ?unitId=). */
export function GET(request: Request) {
  return handleRoute(async () => {
    const actor = await requireRole();
    const { unitId } = parseInput(querySchema, Object.fromEntries(new URL(request.url).searchParams));
    if (unitId !== undefined) assertUnitAccess(actor, unitId);
    const unitIds = unitId !== undefined ? [unitId] : actor.unitIds;
    const [units, beds] = await Promise.all([summariseUnits(db(), unitIds), listOccupiedBeds(db(), unitIds)]);
    return NextResponse.json({ units, beds });
  });
}

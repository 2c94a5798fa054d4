import { NextResponse } from "next/server";
import { z } from "zod";
import { assertUnitAccess } from "@/lib/auth/actor-queries";
import { requireRole } from "@/lib/auth/guard";
import { loadBoard } from "@/lib/board/queries";
import { db } from "@/lib/db";
import { handleRoute } from "@/lib/http";
import { parseInput } from "@/lib/validation";

const querySchema = z.object({ unitId: z.coerce.number().int().positive().optional() });

/**
 * The Board of the caller's units (or one of them with ?unitId=): units with
 * bed counts, one row per occupied bed, and the server time it was computed at.
 */
export function GET(request: Request) {
  return handleRoute(async () => {
    const actor = await requireRole();
    const { unitId } = parseInput(
      querySchema,
      Object.fromEntries(new URL(request.url).searchParams),
    );
    if (unitId !== undefined) assertUnitAccess(actor, unitId);
    const unitIds = unitId !== undefined ? [unitId] : actor.unitIds;
    return NextResponse.json(await loadBoard(db(), unitIds), {
      headers: { "Cache-Control": "no-store" },
    });
  });
}

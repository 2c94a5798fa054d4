import { NextResponse } from "next/server";
import { requireRole } from "@/lib/auth/guard";
import { db } from "@/lib/db";
import { handleRoute } from "@/lib/http";
import { chainUnitId, verifyLedger } from "@/lib/ledger/verify";

/**
 * Walks every hash chain: `{ ok, checked, firstBroken }`. Admins and reviewers
 * see where a break is; others see which break only if it is on their units.
 */
export function GET() {
  return handleRoute(async () => {
    const actor = await requireRole();
    const result = await verifyLedger(db());
    const broken = result.firstBroken;
    if (!broken || actor.role === "admin" || actor.role === "reviewer")
      return NextResponse.json(result);
    const unitId = await chainUnitId(db(), broken.chainKey);
    const visible = unitId !== null && actor.unitIds.includes(unitId);
    return NextResponse.json(
      visible
        ? result
        : {
            ...result,
            firstBroken: {
              id: 0,
              chainKey: "outside your units",
              chainSeq: 0,
              problem:
                "a chain outside your units is broken; a reviewer or administrator can see where",
            },
          },
    );
  });
}

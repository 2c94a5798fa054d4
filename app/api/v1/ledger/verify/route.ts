import { NextResponse } from "next/server";
import { z } from "zod";
import { requireRole } from "@/lib/auth/guard";
import { db } from "@/lib/db";
import { handleRoute } from "@/lib/http";
import { chainUnitId, verifyLedger, type LedgerProblem } from "@/lib/ledger/verify";
import { parseInput } from "@/lib/validation";
import { consumeQuota } from "@/lib/rate-limit";
import { can } from "@/lib/auth/permissions";

const querySchema = z.object({ mode: z.enum(["full", "incremental"]).default("full") });

/**
 * Walks every hash chain — or, with `?mode=incremental`, only what follows the
 * last anchor — and compares the heads with that anchor:
 * `{ ok, checked, firstBroken, problems, mode, anchor }`. Admins and reviewers
 * see where a break is; others see which break only if it is on their units.
 */
export function GET(request: Request) {
  return handleRoute(async () => {
    const actor = await requireRole();
    await consumeQuota(db(), `user:${actor.id}`, "ledger_verify");
    const { mode } = parseInput(querySchema, Object.fromEntries(new URL(request.url).searchParams));
    const result = await verifyLedger(db(), { mode });
    const broken = result.firstBroken;
    if (!broken || can(actor, "ledger.oversee")) return NextResponse.json(result);
    const visible = async (p: LedgerProblem) => {
      const unitId = await chainUnitId(db(), p.chainKey);
      return unitId !== null && actor.unitIds.includes(unitId);
    };
    const problems: LedgerProblem[] = [];
    for (const p of result.problems ?? []) if (await visible(p)) problems.push(p);
    return NextResponse.json({
      ...result,
      problems,
      firstBroken: (await visible(broken))
        ? broken
        : {
            id: 0,
            chainKey: "outside your units",
            chainSeq: 0,
            problem:
              "a chain outside your units is broken; a reviewer or administrator can see where",
          },
    });
  });
}

import { NextResponse } from "next/server";
import { requireRole } from "@/lib/auth/guard";
import { db } from "@/lib/db";
import { handleRoute, idParam } from "@/lib/http";
import { getBedsideContext } from "@/lib/patients/bedside";
import { parseInput } from "@/lib/validation";

/**
 * Order in effect, applied settings, latest reading and gas, and the engine's
 * proposal. `?useStaleBloodGas=1`: forecast from an arterial gas older than the
 * site's limit (a clinician's choice; otherwise such a gas is not used).
 */
export function GET(request: Request, { params }: { params: Promise<{ patientId: string }> }) {
  return handleRoute(async () => {
    const actor = await requireRole();
    const { patientId } = parseInput(idParam("patientId"), await params) as { patientId: number };
    const useStaleBloodGas = new URL(request.url).searchParams.get("useStaleBloodGas") === "1";
    return NextResponse.json(await getBedsideContext(db(), actor, patientId, { useStaleBloodGas }));
  });
}

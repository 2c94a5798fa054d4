import { NextResponse } from "next/server";
import { requirePermission } from "@/lib/auth/guard";
import type { BloodGasInput } from "@/lib/blood-gases/schema";
import { recordBloodGas } from "@/lib/blood-gases/service";
import { db } from "@/lib/db";
import { handleRoute, readWriteBody } from "@/lib/http";

/** Records a blood gas (mmHg, g/dL) and returns it with its computed indices. */
export function POST(request: Request) {
  return handleRoute(async () => {
    const actor = await requirePermission("blood_gas.record");
    const bloodGas = await recordBloodGas(db(), actor, (await readWriteBody(request)) as BloodGasInput);
    return NextResponse.json({ bloodGas }, { status: 201 });
  });
}

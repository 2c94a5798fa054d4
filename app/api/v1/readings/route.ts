import { NextResponse } from "next/server";
import { requirePermission } from "@/lib/auth/guard";
import { db } from "@/lib/db";
import { handleRoute, readWriteBody } from "@/lib/http";
import type { ReadingInput } from "@/lib/readings/schema";
import { chartReading } from "@/lib/readings/service";

/** Charts an SpO2 reading with the device and oxygen in use. */
export function POST(request: Request) {
  return handleRoute(async () => {
    const actor = await requirePermission("reading.chart");
    const reading = await chartReading(db(), actor, (await readWriteBody(request)) as ReadingInput);
    return NextResponse.json({ reading }, { status: 201 });
  });
}

import { NextResponse } from "next/server";
import { z } from "zod";
import { requireRole } from "@/lib/auth/guard";
import { db } from "@/lib/db";
import { handleRoute, idParam } from "@/lib/http";
import { getTrend } from "@/lib/patients/trend";
import { parseInput } from "@/lib/validation";

/** Longest range one request may ask for; the stay is clamped to the admission in getTrend. */
const MAX_SPAN_MS = 31 * 24 * 3600_000;

const isoTime = (field: string) =>
  z.iso.datetime({
    offset: true,
    error: `${field} must be an ISO 8601 time, e.g. 2026-12-01T08:00:00Z.`,
  });

const querySchema = z
  .object({ from: isoTime("From"), to: isoTime("To") })
  .transform((q) => ({ from: new Date(q.from), to: new Date(q.to) }))
  .superRefine((q, ctx) => {
    const span = q.to.getTime() - q.from.getTime();
    if (span <= 0)
      ctx.addIssue({ code: "custom", path: ["to"], message: "To must be after from." });
    else if (span > MAX_SPAN_MS)
      ctx.addIssue({
        code: "custom",
        path: ["to"],
        message: "The range may span at most 31 days.",
      });
  });

/** The Chart's trend between ?from and ?to (ISO times), SpO2 thinned when the range is long. */
export function GET(request: Request, { params }: { params: Promise<{ patientId: string }> }) {
  return handleRoute(async () => {
    const actor = await requireRole();
    const { patientId } = parseInput(idParam("patientId"), await params) as { patientId: number };
    const range = parseInput(querySchema, Object.fromEntries(new URL(request.url).searchParams));
    return NextResponse.json(await getTrend(db(), actor, patientId, range));
  });
}

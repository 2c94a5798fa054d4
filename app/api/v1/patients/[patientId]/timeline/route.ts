import { NextResponse } from "next/server";
import { z } from "zod";
import { requireRole } from "@/lib/auth/guard";
import { db } from "@/lib/db";
import { handleRoute, idParam } from "@/lib/http";
import { listTimeline, TIMELINE_KINDS, type TimelineKind } from "@/lib/patients/timeline";
import { parseInput } from "@/lib/validation";

const querySchema = z.object({
  kinds: z
    .string()
    .optional()
    .transform((v) => (v ? v.split(",").filter(Boolean) : []))
    .pipe(
      z.array(
        z.enum(TIMELINE_KINDS, { error: `Kinds must be among ${TIMELINE_KINDS.join(", ")}.` }),
      ),
    ),
  before: z.string().max(80, "The timeline position (before) is too long.").optional(),
  limit: z.coerce
    .number({ error: "Limit must be a whole number from 1 to 200." })
    .int("Limit must be a whole number from 1 to 200.")
    .min(1, "Limit must be a whole number from 1 to 200.")
    .max(200, "Limit must be a whole number from 1 to 200.")
    .default(50),
});

/** The Chart's timeline, newest first: ?kinds=order,reading&before=<cursor>&limit=50. */
export function GET(request: Request, { params }: { params: Promise<{ patientId: string }> }) {
  return handleRoute(async () => {
    const actor = await requireRole();
    const { patientId } = parseInput(idParam("patientId"), await params) as { patientId: number };
    const search = Object.fromEntries(new URL(request.url).searchParams);
    const query = parseInput(querySchema, search);
    const page = await listTimeline(db(), actor, patientId, {
      kinds: query.kinds as TimelineKind[],
      ...(query.before ? { before: query.before } : {}),
      limit: query.limit,
    });
    return NextResponse.json(page);
  });
}

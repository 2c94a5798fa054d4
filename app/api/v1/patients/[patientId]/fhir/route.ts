import { z } from "zod";
import { authenticateApiToken } from "@/lib/api-tokens/service";
import { requireRole } from "@/lib/auth/guard";
import { db } from "@/lib/db";
import { getEnv } from "@/lib/env";
import { exportPatientFhir } from "@/lib/fhir/queries";
import { handleRoute, idParam } from "@/lib/http";
import { parseInput } from "@/lib/validation";
import { consumeQuota } from "@/lib/rate-limit";

const querySchema = z.object({
  since: z.iso
    .datetime({
      offset: true,
      error: "Since must be an ISO 8601 time, e.g. 2026-12-01T08:00:00Z.",
    })
    .transform((v) => new Date(v))
    .optional(),
  download: z.enum(["0", "1"], { error: "Download must be 0 or 1." }).optional(),
});

/**
 * The patient's current admission as a FHIR R4 Bundle (application/fhir+json):
 * ?since=<ISO time> limits readings, gases and settings; ?download=1 names the file.
 * Signed-in users, or an interface engine with an API token (read or write)
 * covering the patient's unit. Errors keep the API's one JSON error shape.
 */
export function GET(request: Request, { params }: { params: Promise<{ patientId: string }> }) {
  return handleRoute(async () => {
    const authorization = request.headers.get("authorization");
    const token = authorization ? await authenticateApiToken(db(), authorization, "read") : null;
    const actor = token ? null : await requireRole();
    const reader = token ? { unitIds: token.unitIds } : actor!;
    await consumeQuota(db(), token ? `token:${token.tokenId}` : `user:${actor!.id}`, "fhir_export");
    const { patientId } = parseInput(idParam("patientId"), await params) as { patientId: number };
    const query = parseInput(querySchema, Object.fromEntries(new URL(request.url).searchParams));
    const { bundle, mrn } = await exportPatientFhir(db(), reader, patientId, {
      installation: getEnv().NEXTAUTH_URL,
      ...(query.since ? { since: query.since } : {}),
    });
    const headers: Record<string, string> = {
      "content-type": "application/fhir+json; charset=utf-8",
      "cache-control": "no-store",
    };
    if (query.download === "1") {
      const safeMrn = mrn.replace(/[^A-Za-z0-9_-]/g, "_");
      headers["content-disposition"] = `attachment; filename="patient-${safeMrn}-fhir.json"`;
    }
    return new Response(JSON.stringify(bundle), { headers });
  });
}

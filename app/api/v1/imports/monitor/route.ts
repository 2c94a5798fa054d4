import { NextResponse } from "next/server";
import { z } from "zod";
import { authenticateApiToken, tokenUnit } from "@/lib/api-tokens/service";
import { db } from "@/lib/db";
import { handleRoute } from "@/lib/http";
import { partialAccepted, readBodyBytes } from "@/lib/imports/body";
import { loadUnit } from "@/lib/imports/evaluate";
import { importFromToken, MAX_IMPORT_BYTES } from "@/lib/imports/service";
import { parseInput } from "@/lib/validation";

const query = z.object({
  mrn: z.string().trim().min(1, "Give the patient's MRN (?mrn=…).").max(20),
  bed: z.string().trim().min(1, "Give the monitor's bed (?bed=…).").max(16),
  unit: z.string().trim().max(16).optional(),
  file: z.string().trim().max(255).optional(),
});

/**
 * A monitor SpO2 series as a CSV body (`time,spo2[,pulse_rate]`), for the
 * patient named by `?mrn=&bed=` (and `&unit=` when the token covers several).
 * Same answers as the HL7 route.
 */
export function POST(request: Request) {
  return handleRoute(async () => {
    const token = await authenticateApiToken(db(), request.headers.get("authorization"), "write");
    const url = new URL(request.url);
    const params = parseInput(query, Object.fromEntries(url.searchParams));
    const partial = partialAccepted(url.searchParams.get("partial"));
    const unitId = await tokenUnit(db(), token, params.unit ?? null);
    const content = await readBodyBytes(request, MAX_IMPORT_BYTES.monitor_csv);
    const unit = (await loadUnit(db(), unitId))!;
    const { created, preview } = await importFromToken(db(), token, {
      kind: "monitor_csv",
      content,
      fileName: params.file ?? `monitor-${params.bed}.csv`,
      partial,
      unit,
      mrn: params.mrn,
      bed: params.bed,
    });
    // The accepted sample is for the app's preview; an interface engine needs the counts and rejections.
    const { sample: _sample, ...summary } = preview;
    void _sample;
    return NextResponse.json(
      { import: summary, replayed: !created },
      { status: created ? 201 : 200 },
    );
  });
}

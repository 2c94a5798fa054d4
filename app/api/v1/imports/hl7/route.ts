import { NextResponse } from "next/server";
import { authenticateApiToken } from "@/lib/api-tokens/service";
import { db } from "@/lib/db";
import { handleRoute } from "@/lib/http";
import { partialAccepted, readBodyBytes } from "@/lib/imports/body";
import { loadUnit } from "@/lib/imports/evaluate";
import { importFromToken, MAX_IMPORT_BYTES } from "@/lib/imports/service";

/**
 * One HL7 v2 ORU^R01 message as the raw body, from an interface engine with a
 * write token. 201 imported; 200 the same MSH-10 was imported before (nothing
 * changed); 422 with every rejected row unless `?partial=accept`.
 */
export function POST(request: Request) {
  return handleRoute(async () => {
    const token = await authenticateApiToken(db(), request.headers.get("authorization"), "write");
    const url = new URL(request.url);
    const partial = partialAccepted(url.searchParams.get("partial"));
    const content = await readBodyBytes(request, MAX_IMPORT_BYTES.hl7);
    const unit = (await loadUnit(db(), token.unitIds[0]!))!;
    const { created, preview } = await importFromToken(db(), token, {
      kind: "hl7",
      content,
      fileName: "hl7-message.hl7",
      partial,
      unit,
    });
    return NextResponse.json(
      { import: preview, replayed: !created },
      { status: created ? 201 : 200 },
    );
  });
}

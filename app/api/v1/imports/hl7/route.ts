import { NextResponse } from "next/server";
import { applyAdtMessage } from "@/lib/admissions/adt";
import { authenticateApiToken } from "@/lib/api-tokens/service";
import { db } from "@/lib/db";
import { handleRoute } from "@/lib/http";
import { partialAccepted, readBodyBytes } from "@/lib/imports/body";
import { loadUnit } from "@/lib/imports/evaluate";
import { messageTypeOf } from "@/lib/imports/hl7-adt";
import { importFromToken, MAX_IMPORT_BYTES } from "@/lib/imports/service";
import { asDomain } from "@/lib/imports/upload-rules";

/**
 * One HL7 v2 message as the raw body, from an interface engine with a write
 * token, routed by MSH-9: ORU^R01 results are imported (201; 422 with every
 * rejected row unless `?partial=accept`); ADT^A01/A02/A03/A08 admit, move,
 * discharge or update the patient (201). The same MSH-10 again answers 200
 * with what the first did, and changes nothing.
 */
export function POST(request: Request) {
  return handleRoute(async () => {
    const token = await authenticateApiToken(db(), request.headers.get("authorization"), "write");
    const url = new URL(request.url);
    const partial = partialAccepted(url.searchParams.get("partial"));
    const content = await readBodyBytes(request, MAX_IMPORT_BYTES.hl7);
    const text = content.toString("utf8");
    let type: string;
    try {
      type = messageTypeOf(text).type;
    } catch (error) {
      throw asDomain(error);
    }
    if (type === "ADT") {
      const { replayed, outcome } = await applyAdtMessage(db(), token, text);
      return NextResponse.json({ adt: outcome, replayed }, { status: replayed ? 200 : 201 });
    }
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

import { NextResponse } from "next/server";
import { requirePermission } from "@/lib/auth/guard";
import { db } from "@/lib/db";
import { DomainError } from "@/lib/errors";
import { getEnv } from "@/lib/env";
import { handleRoute, readBodyBytes } from "@/lib/http";
import { listImportsOperation } from "@/lib/imports/operations";
import { readRoute } from "@/lib/boundary/next";
import { MAX_IMPORT_BYTES, uploadForPreview } from "@/lib/imports/service";
import { uploadSchema } from "@/lib/imports/upload-rules";
import { parseInput } from "@/lib/validation";
import { allowedOrigins, refuseCrossSiteWrite } from "@/lib/request-guard";

/** The latest imports of the caller's units. */
export const GET = readRoute(listImportsOperation, { respond: (imports) => ({ imports }) });

const field = (form: FormData, name: string) => {
  const v = form.get(name);
  return typeof v === "string" ? v : undefined;
};

/**
 * Upload for preview (multipart: file, kind, unitId, delimiter, mrn, bed).
 * The file is stored and checked; nothing is imported until it is confirmed.
 */
export function POST(request: Request) {
  return handleRoute(async () => {
    // This route is outside the middleware (large bodies): the cross-site rule is applied here.
    const env = getEnv();
    const url = new URL(request.url);
    const refusal = refuseCrossSiteWrite(
      {
        method: request.method,
        pathname: url.pathname,
        headers: request.headers,
        origin: url.origin,
      },
      allowedOrigins(env.NEXTAUTH_URL, env.ALLOWED_ORIGINS),
    );
    if (refusal) throw new DomainError(refusal.message, refusal.status);
    const actor = await requirePermission("import.upload");
    // Counted while it streams in: a 50 MB upload is refused at the cap, not read whole first.
    const body = await readBodyBytes(request, MAX_IMPORT_BYTES.monitor_csv + 64 * 1024);
    let form: FormData;
    try {
      form = await new Response(new Uint8Array(body), {
        headers: { "content-type": request.headers.get("content-type") ?? "" },
      }).formData();
    } catch {
      throw new DomainError("Send the file as multipart/form-data.", 400);
    }
    const file = form.get("file");
    if (!(file instanceof Blob)) {
      throw new DomainError("Choose a file to upload.", 400, {
        file: ["Choose a file to upload."],
      });
    }
    const content = Buffer.from(await file.arrayBuffer());
    const input = parseInput(uploadSchema, {
      kind: field(form, "kind"),
      unitId: field(form, "unitId"),
      fileName: file instanceof File ? file.name : "upload",
      delimiter: field(form, "delimiter"),
      mrn: field(form, "mrn") || undefined,
      bed: field(form, "bed") || undefined,
    });
    const preview = await uploadForPreview(db(), actor, input, content);
    return NextResponse.json({ import: preview }, { status: preview.alreadyImported ? 200 : 201 });
  });
}

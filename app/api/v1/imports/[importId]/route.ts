import { NextResponse } from "next/server";
import { requirePermission } from "@/lib/auth/guard";
import { db } from "@/lib/db";
import { handleRoute, idParam, readJson } from "@/lib/http";
import { readImportOperation } from "@/lib/imports/operations";
import { readRoute } from "@/lib/boundary/next";
import { remapImport } from "@/lib/imports/service";
import { parseInput } from "@/lib/validation";

type Params = { params: Promise<{ importId: string }> };

/** An import's preview or, once imported, its report (JSON). */
export const GET = readRoute(readImportOperation, {
  ids: ["importId"],
  respond: (preview) => ({ import: preview }),
});

/** The mapping step of a CSV blood gas file: body `{ delimiter, columns, units }`; answers the new preview. */
export function PUT(request: Request, { params }: Params) {
  return handleRoute(async () => {
    const actor = await requirePermission("import.upload");
    const { importId } = parseInput(idParam("importId"), await params) as { importId: number };
    const preview = await remapImport(db(), actor, importId, await readJson(request));
    return NextResponse.json({ import: preview });
  });
}

import { NextResponse } from "next/server";
import { requirePermission } from "@/lib/auth/guard";
import { db } from "@/lib/db";
import { handleRoute, idParam, readJson } from "@/lib/http";
import { confirmImport } from "@/lib/imports/service";
import { parseInput } from "@/lib/validation";

/**
 * Imports the good rows of a previewed file: body `{ expectedAccepted }`, the
 * count the person saw. The rows are derived again from the stored file.
 */
export function POST(request: Request, { params }: { params: Promise<{ importId: string }> }) {
  return handleRoute(async () => {
    const actor = await requirePermission("import.upload");
    const { importId } = parseInput(idParam("importId"), await params) as { importId: number };
    const body = (await readJson(request)) as { expectedAccepted?: unknown };
    const preview = await confirmImport(db(), actor, {
      importId,
      expectedAccepted: body?.expectedAccepted as number,
    });
    return NextResponse.json({ import: preview }, { status: preview.alreadyImported ? 200 : 201 });
  });
}

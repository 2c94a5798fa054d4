import { requirePermission } from "@/lib/auth/guard";
import { db } from "@/lib/db";
import { handleRoute, idParam } from "@/lib/http";
import { importReportCsv } from "@/lib/imports/queries";
import { parseInput } from "@/lib/validation";

/** The import report as a CSV download: every rejected row with its reasons. */
export function GET(_request: Request, { params }: { params: Promise<{ importId: string }> }) {
  return handleRoute(async () => {
    const actor = await requirePermission("import.upload");
    const { importId } = parseInput(idParam("importId"), await params) as { importId: number };
    const { fileName, csv } = await importReportCsv(db(), actor, importId);
    return new Response(csv, {
      headers: {
        "content-type": "text/csv; charset=utf-8",
        "content-disposition": `attachment; filename="${fileName}"`,
      },
    });
  });
}

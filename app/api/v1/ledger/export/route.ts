import { requireRole } from "@/lib/auth/guard";
import { db } from "@/lib/db";
import { handleRoute } from "@/lib/http";
import { ledgerCsv, ledgerFilterSchema } from "@/lib/ledger/queries";
import { parseInput } from "@/lib/validation";
import { consumeQuota } from "@/lib/rate-limit";

/** The filtered ledger as a CSV download, streamed. */
export function GET(request: Request) {
  return handleRoute(async () => {
    const actor = await requireRole();
    await consumeQuota(db(), `user:${actor.id}`, "ledger_export");
    const filter = parseInput(
      ledgerFilterSchema,
      Object.fromEntries(new URL(request.url).searchParams),
    );
    const rows = ledgerCsv(db(), actor, filter);
    const encoder = new TextEncoder();
    const body = new ReadableStream<Uint8Array>({
      async pull(controller) {
        const next = await rows.next();
        if (next.done) controller.close();
        else controller.enqueue(encoder.encode(next.value));
      },
    });
    const stamp = new Date().toISOString().slice(0, 19).replace(/[:T]/g, "-");
    return new Response(body, {
      headers: {
        "content-type": "text/csv; charset=utf-8",
        "content-disposition": `attachment; filename="tidemark-ledger-${stamp}.csv"`,
      },
    });
  });
}

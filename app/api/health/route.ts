import { db } from "@/lib/db";

export const dynamic = "force-dynamic";

/**
 * For a load balancer's health check: 200 when this server can reach the
 * database, 503 otherwise. Public, and says nothing else.
 */
export async function GET(): Promise<Response> {
  try {
    await db().raw("SELECT 1");
    return Response.json({ status: "ok" });
  } catch {
    return Response.json({ status: "unavailable" }, { status: 503 });
  }
}

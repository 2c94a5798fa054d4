import { listAlertsOperation } from "@/lib/alerts/operations";
import { readRoute } from "@/lib/boundary/next";

/** Alerts on the caller's units; filters in the query (lib/alerts/operations.ts). */
export const GET = readRoute(listAlertsOperation, { respond: (alerts) => ({ alerts }) });

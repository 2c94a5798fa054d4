import { alertSummaryOperation } from "@/lib/alerts/operations";
import { readRoute } from "@/lib/boundary/next";

/** The header badge: counts of unresolved alerts on the caller's units. */
export const GET = readRoute(alertSummaryOperation, { respond: (summary) => summary });

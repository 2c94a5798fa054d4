import { resolveAlertOperation } from "@/lib/alerts/operations";
import { writeRoute } from "@/lib/boundary/next";

/** Close an alert by hand: `{ reason }` (required). */
export const POST = writeRoute(resolveAlertOperation, {
  ids: ["alertId"],
  respond: (alert) => ({ alert }),
});

import { acknowledgeAlertOperation } from "@/lib/alerts/operations";
import { writeRoute } from "@/lib/boundary/next";

/** Acknowledge an alert: `{ note? }`. Escalation stops; a second acknowledgement is a 409. */
export const POST = writeRoute(acknowledgeAlertOperation, {
  ids: ["alertId"],
  optionalBody: true,
  respond: (alert) => ({ alert }),
});

import { writeRoute } from "@/lib/boundary/next";
import { acknowledgeHandoffOperation } from "@/lib/handoff/operations";

/** A bed acknowledged again answers the first acknowledgement (alreadyAcknowledged: true). */
export const POST = writeRoute(acknowledgeHandoffOperation, {
  ids: ["unitId"],
  respond: (acknowledgement) => ({ acknowledgement }),
});

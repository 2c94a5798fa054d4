import { writeRoute } from "@/lib/boundary/next";
import { cosignOrderOperation } from "@/lib/orders/operations";

/** The named prescriber co-signs a verbal or telephone order: `{ version, password }`. */
export const POST = writeRoute(cosignOrderOperation, {
  ids: ["orderId"],
  respond: (order) => ({ order }),
});

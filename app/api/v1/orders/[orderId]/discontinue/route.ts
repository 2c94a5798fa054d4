import { writeRoute } from "@/lib/boundary/next";
import { discontinueOrderOperation } from "@/lib/orders/operations";

/** A physician discontinues an order: `{ version, reason, password }`. */
export const POST = writeRoute(discontinueOrderOperation, {
  ids: ["orderId"],
  respond: (order) => ({ order }),
});

import { writeRoute } from "@/lib/boundary/next";
import { readOrderChangeOperation } from "@/lib/order-notices/operations";

/** The caller has read this order's change (no body): their notices of it are marked read. */
export const POST = writeRoute(readOrderChangeOperation, {
  ids: ["orderId"],
  optionalBody: true,
  respond: (read) => ({ read }),
});

import { writeRoute } from "@/lib/boundary/next";
import { replyOrderRequestOperation } from "@/lib/order-requests/operations";

/** A physician answers a request without an order: `{ reply }`; it closes (409 if already closed). */
export const POST = writeRoute(replyOrderRequestOperation, {
  ids: ["requestId"],
  respond: (request) => ({ request }),
});

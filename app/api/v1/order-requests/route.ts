import { readRoute, writeRoute } from "@/lib/boundary/next";
import {
  listOrderRequestsOperation,
  sendOrderRequestOperation,
} from "@/lib/order-requests/operations";

/** Order requests on the caller's units (the physician's queue first); filters in the query. */
export const GET = readRoute(listOrderRequestsOperation, { respond: (requests) => ({ requests }) });

/** A therapist or nurse asks for a new order; it goes to the shift's responsible physician. */
export const POST = writeRoute(sendOrderRequestOperation, {
  status: 201,
  respond: (request) => ({ request }),
});

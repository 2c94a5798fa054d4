import { readRoute } from "@/lib/boundary/next";
import { readOrderOperation } from "@/lib/orders/operations";

/** An order as it stands, or as it stood at `?asOf=` (system-versioned history). */
export const GET = readRoute(readOrderOperation, { ids: ["orderId"], respond: (result) => result });

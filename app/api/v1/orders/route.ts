import { writeRoute } from "@/lib/boundary/next";
import { writeOrderOperation } from "@/lib/orders/operations";

/** Writes an order: a physician's signed order, or a nurse's/therapist's verbal order. */
export const POST = writeRoute(writeOrderOperation, {
  status: 201,
  respond: (order) => ({ order }),
});

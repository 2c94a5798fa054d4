import { recordAdjustmentOperation } from "@/lib/adjustments/operations";
import { writeRoute } from "@/lib/boundary/next";

/** Records an applied settings change within the order in effect. */
export const POST = writeRoute(recordAdjustmentOperation, {
  status: 201,
  respond: (adjustment) => ({ adjustment }),
});

import { recordBloodGasOperation } from "@/lib/blood-gases/operations";
import { writeRoute } from "@/lib/boundary/next";

/** Records a blood gas (mmHg, g/dL) and returns it with its computed indices. */
export const POST = writeRoute(recordBloodGasOperation, {
  status: 201,
  respond: (bloodGas) => ({ bloodGas }),
});

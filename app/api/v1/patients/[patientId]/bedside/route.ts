import { readRoute } from "@/lib/boundary/next";
import { readBedsideOperation } from "@/lib/chart/operations";

/** Order in effect, settings, latest values and the engine's proposal (`?useStaleBloodGas=1`). */
export const GET = readRoute(readBedsideOperation, {
  ids: ["patientId"],
  respond: (result) => result,
});

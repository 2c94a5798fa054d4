import { readRoute } from "@/lib/boundary/next";
import { readTrendOperation } from "@/lib/chart/operations";

/** The Chart's trend between `?from` and `?to` (ISO times). */
export const GET = readRoute(readTrendOperation, {
  ids: ["patientId"],
  respond: (result) => result,
});

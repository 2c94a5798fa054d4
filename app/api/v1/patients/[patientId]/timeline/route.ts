import { readRoute } from "@/lib/boundary/next";
import { readTimelineOperation } from "@/lib/chart/operations";

/** The Chart's timeline, newest first: `?kinds=order,reading&before=<cursor>&limit=50`. */
export const GET = readRoute(readTimelineOperation, {
  ids: ["patientId"],
  respond: (result) => result,
});

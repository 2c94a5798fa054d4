import { readRoute, writeRoute } from "@/lib/boundary/next";
import { readAssignmentsOperation, setAssignmentsOperation } from "@/lib/assignments/operations";

/** One shift's grid: `?shift=current|next|previous|<ISO start>` (current when left out). */
export const GET = readRoute(readAssignmentsOperation, {
  ids: ["unitId"],
  respond: (grid) => ({ grid }),
});

/** Bulk: replaces the given cells (and the charge nurse, if given) of the current or next shift. */
export const PUT = writeRoute(setAssignmentsOperation, {
  ids: ["unitId"],
  respond: (result) => result,
});

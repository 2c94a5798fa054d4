import { writeRoute } from "@/lib/boundary/next";
import { updateUnitOperation } from "@/lib/units/operations";

/** Full edit of the settings; the body names the version it was based on (409 if stale). */
export const PATCH = writeRoute(updateUnitOperation, {
  ids: ["unitId"],
  respond: ({ unit, warnings }) => ({ unit, warnings }),
});

import { writeRoute } from "@/lib/boundary/next";
import { updateBedOperation } from "@/lib/units/operations";

/** Rename (label), retire (active: false) or restore (active: true) a bed. */
export const PATCH = writeRoute(updateBedOperation, {
  ids: ["unitId", "bedId"],
  respond: (bed) => ({ bed }),
});

import { readRoute } from "@/lib/boundary/next";
import { readHandoffOperation } from "@/lib/handoff/operations";

/** ?shift=next (default) or the ISO start of the shift handed to. */
export const GET = readRoute(readHandoffOperation, {
  ids: ["unitId"],
  respond: (handoff) => ({ handoff }),
});

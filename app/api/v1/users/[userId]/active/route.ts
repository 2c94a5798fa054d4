import { writeRoute } from "@/lib/boundary/next";
import { setUserActiveOperation } from "@/lib/users/operations";

/** Deactivate or reactivate: `{ version, active, rationale, currentPassword }`. */
export const POST = writeRoute(setUserActiveOperation, {
  ids: { userId: "id" },
  respond: (user) => ({ user }),
});

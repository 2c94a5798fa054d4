import { readRoute, writeRoute } from "@/lib/boundary/next";
import { readUserOperation, updateUserOperation } from "@/lib/users/operations";

export const GET = readRoute(readUserOperation, {
  ids: { userId: "id" },
  respond: (user) => ({ user }),
});

/** Full update; the body names the version it was based on (409 if stale). */
export const PATCH = writeRoute(updateUserOperation, {
  ids: { userId: "id" },
  respond: (user) => ({ user }),
});

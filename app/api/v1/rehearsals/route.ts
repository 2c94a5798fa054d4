import { readRoute, writeRoute } from "@/lib/boundary/next";
import { listRehearsalsOperation, requestRehearsalOperation } from "@/lib/rehearsal/operations";

/** A unit's rehearsals: `?unitId=`. */
export const GET = readRoute(listRehearsalsOperation, {
  respond: (rehearsals) => ({ rehearsals }),
});

/** Queue a rehearsal (physicians and admins): 202 with the queued run; poll it for progress. */
export const POST = writeRoute(requestRehearsalOperation, {
  respond: (rehearsal) => ({ rehearsal }),
  status: 202,
  quota: "rehearsal",
});

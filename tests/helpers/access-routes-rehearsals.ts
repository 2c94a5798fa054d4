import { rehearsalBody } from "./access-fixtures";
import type { RouteEntry } from "./access-matrix";

// Rehearsals: physicians and admins ask for runs of their units; everyone
// reads those of their own units; another unit answers 404 either way.

export const REHEARSAL_ROUTES: Omit<RouteEntry, "via">[] = [
  {
    name: "POST /api/v1/rehearsals",
    permission: "rehearsal.run",
    scope: "unit",
    ok: 202,
    call: async (w, c) => ({
      path: "/api/v1/rehearsals",
      method: "POST",
      json: await rehearsalBody(w.unitId[c.unit], `Matrix ${c.role ?? "anonymous"}`),
    }),
  },
  {
    name: "GET /api/v1/rehearsals",
    permission: "record.read",
    scope: "unit",
    ok: 200,
    call: (w, c) => ({ path: `/api/v1/rehearsals?unitId=${w.unitId[c.unit]}` }),
  },
  {
    name: "GET /api/v1/rehearsals/[rehearsalId]",
    permission: "record.read",
    scope: "unit",
    ok: 200,
    call: (w, c) => ({ path: `/api/v1/rehearsals/${w.shared[c.unit].rehearsalId}` }),
  },
];

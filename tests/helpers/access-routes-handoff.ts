import type { UnitCode, World } from "./access-fixtures";
import type { ActionEntry, RouteEntry } from "./access-matrix";
import { appDb } from "./db";

// The shift handoff: everyone on the unit reads it, nurses acknowledge; another
// unit answers 404. Acknowledging the same bed again is an idempotent replay,
// so the allowed cells can share the unit's open admission.

/** An open admission on the unit (the shared patient's, unless it has moved on). */
async function openAdmission(w: World, unit: UnitCode): Promise<number> {
  const row = (await appDb()("admissions as a")
    .join("beds as b", "b.id", "a.bed_id")
    .where("b.unit_id", w.unitId[unit])
    .where("b.active", true)
    .whereNull("a.discharged_at")
    .orderByRaw("a.patient_id = ? DESC", [w.shared[unit].patientId])
    .first("a.id")) as { id: number } | undefined;
  if (!row) throw new Error(`fixture: no open admission on ${unit}`);
  return row.id;
}

export const HANDOFF_ROUTES: Omit<RouteEntry, "via">[] = [
  {
    name: "GET /api/v1/units/[unitId]/handoff",
    permission: "record.read",
    scope: "unit",
    ok: 200,
    call: (w, c) => ({ path: `/api/v1/units/${w.unitId[c.unit]}/handoff?shift=next` }),
  },
  {
    name: "POST /api/v1/units/[unitId]/handoff/acknowledge",
    permission: "handoff.acknowledge",
    scope: "unit",
    ok: 200,
    call: async (w, c) => ({
      path: `/api/v1/units/${w.unitId[c.unit]}/handoff/acknowledge`,
      method: "POST",
      json: { shift: "next", admissionIds: [await openAdmission(w, c.unit)] },
    }),
  },
];

export const HANDOFF_ACTIONS: Omit<ActionEntry, "via">[] = [
  {
    name: "acknowledgeHandoffAction",
    permission: "handoff.acknowledge",
    scope: "unit",
    ok: 200,
    arg: async (w, c) => ({
      unitId: w.unitId[c.unit],
      admissionIds: [await openAdmission(w, c.unit)],
    }),
  },
];

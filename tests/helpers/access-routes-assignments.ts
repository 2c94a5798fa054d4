import { mayAssign } from "@/lib/assignments/may-assign";
import type { Role } from "@/lib/auth/roles";
import { freshPatient, type UnitCode, type World } from "./access-fixtures";
import type { ActionEntry, RouteEntry } from "./access-matrix";
import { appDb } from "./db";

// Shift assignments: a fresh bed's nurse for the next shift, given to the
// matrix's own nurse (on MICU). The matrix's nurses hold no charge duty, so the
// table's row ("assignment.manage": nurse, admin) narrows to admins.

export const assignmentAllows = (role: Role) =>
  mayAssign({ role, isCurrentCharge: false, place: "next" }).allowed;

async function freshBed(unit: UnitCode): Promise<number> {
  const { patientId } = await freshPatient(unit);
  const row = (await appDb()("admissions").where({ patient_id: patientId }).first("bed_id")) as {
    bed_id: number;
  };
  return row.bed_id;
}

export async function assignmentBody(w: World, unit: UnitCode) {
  return {
    unitId: w.unitId[unit],
    shift: "next",
    cells: [{ bedId: await freshBed(unit), duty: "nurse", userId: w.actor.nurse.id }],
  };
}

export const ASSIGNMENT_ROUTES: Omit<RouteEntry, "via">[] = [
  {
    name: "GET /api/v1/units/[unitId]/assignments",
    permission: "record.read",
    scope: "unit",
    ok: 200,
    call: (w, c) => ({ path: `/api/v1/units/${w.unitId[c.unit]}/assignments?shift=current` }),
  },
  {
    name: "PUT /api/v1/units/[unitId]/assignments",
    permission: "assignment.manage",
    allows: assignmentAllows,
    scope: "unit",
    ok: 200,
    call: async (w, c) => {
      const { unitId, ...body } = await assignmentBody(w, c.unit);
      return { path: `/api/v1/units/${unitId}/assignments`, method: "PUT", json: body };
    },
  },
];

export const ASSIGNMENT_ACTIONS: Omit<ActionEntry, "via">[] = [
  {
    name: "setAssignmentsAction",
    permission: "assignment.manage",
    allows: assignmentAllows,
    scope: "unit",
    ok: 200,
    arg: (w, c) => assignmentBody(w, c.unit),
  },
];

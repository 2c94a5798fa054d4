import { randomUUID } from "node:crypto";
import type { UnitDetail } from "@/lib/units/queries";
import { getUnit } from "@/lib/units/queries";
import { OWN, type UnitCode, type World } from "./access-fixtures";
import type { ActionEntry, RouteEntry } from "./access-matrix";
import { appDb } from "./db";

// Units and beds: the admin administers the units they belong to (another unit
// is a 404). Edits send the unit's current settings back unchanged, so the
// shared units keep the seeded ones; new beds are fresh and empty.

const tag = () => randomUUID().replace(/-/g, "").slice(0, 8).toUpperCase();

export function newUnitBody() {
  return {
    code: `MX${tag()}`,
    name: "Matrix Unit",
    kind: "ward",
    altitudeM: 40,
    timeZone: "UTC",
    shiftStart: "07:00",
    shiftHours: 12,
    allowedDevices: ["nasal_cannula", "venturi_mask"],
    fallbackEmail: "",
    rationale: "access matrix",
  };
}

/** The unit's settings as they stand, with the version to edit from. */
async function unchangedUnitBody(unitId: number) {
  const u = (await getUnit(appDb(), unitId)) as UnitDetail;
  return {
    name: u.name,
    kind: u.kind,
    altitudeM: u.altitudeM,
    timeZone: u.timeZone,
    shiftStart: u.shiftStart,
    shiftHours: u.shiftHours,
    allowedDevices: u.allowedDevices,
    fallbackEmail: u.fallbackEmail ?? "",
    rationale: "access matrix: no change",
    version: u.version,
  };
}

/** An empty bed on the unit, written directly (not through the door under test). */
async function emptyBed(w: World, unit: UnitCode): Promise<number> {
  const [id] = await appDb()("beds").insert({
    unit_id: w.unitId[unit],
    label: `MX${tag()}`,
    sort_order: 950,
  });
  return Number(id);
}

export const UNIT_ROUTES: Omit<RouteEntry, "via">[] = [
  {
    name: "GET /api/v1/units",
    permission: "record.read",
    scope: "list",
    ok: 200,
    call: (w, c) => ({ path: "/api/v1/units", marker: w.unitId[c.unit] }),
    shows: (body, id) =>
      ((JSON.parse(body) as { units: { id: number }[] }).units ?? []).some((u) => u.id === id),
  },
  {
    name: "POST /api/v1/units",
    permission: "unit.manage",
    scope: "none",
    ok: 201,
    call: () => ({ path: "/api/v1/units", method: "POST", json: newUnitBody() }),
  },
  {
    name: "PATCH /api/v1/units/[unitId]",
    permission: "unit.manage",
    scope: "unit",
    ok: 200,
    call: async (w, c) => ({
      path: `/api/v1/units/${w.unitId[c.unit]}`,
      method: "PATCH",
      json: await unchangedUnitBody(w.unitId[c.unit]),
    }),
  },
  {
    name: "POST /api/v1/units/[unitId]/beds",
    permission: "unit.manage",
    scope: "unit",
    ok: 201,
    call: (w, c) => ({
      path: `/api/v1/units/${w.unitId[c.unit]}/beds`,
      method: "POST",
      json: { label: `MX${tag()}` },
    }),
  },
  {
    name: "PATCH /api/v1/units/[unitId]/beds/[bedId]",
    permission: "unit.manage",
    scope: "unit",
    ok: 200,
    call: async (w, c) => ({
      path: `/api/v1/units/${w.unitId[c.unit]}/beds/${await emptyBed(w, c.unit)}`,
      method: "PATCH",
      json: { active: false },
    }),
  },
];

export const UNIT_ACTIONS: Omit<ActionEntry, "via">[] = [
  {
    name: "createUnitAction",
    permission: "unit.manage",
    scope: "none",
    ok: 200,
    arg: () => newUnitBody(),
  },
  {
    name: "updateUnitAction",
    permission: "unit.manage",
    scope: "unit",
    ok: 200,
    arg: async (w, c) => ({
      ...(await unchangedUnitBody(w.unitId[c.unit])),
      unitId: w.unitId[c.unit],
    }),
  },
  {
    name: "createBedAction",
    permission: "unit.manage",
    scope: "unit",
    ok: 200,
    arg: (w, c) => ({ unitId: w.unitId[c.unit], label: `MX${tag()}` }),
  },
  {
    name: "updateBedAction",
    permission: "unit.manage",
    scope: "unit",
    ok: 200,
    arg: async (w, c) => ({
      unitId: w.unitId[c.unit],
      bedId: await emptyBed(w, c.unit),
      label: `MX${tag()}`,
    }),
  },
];

/** The page a unit's bed actions are posted to. */
export const unitPageParams = (w: World) => ({ unitId: w.unitId[OWN] });

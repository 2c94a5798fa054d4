import type { Knex } from "knex";
import { DEVICES, type Device } from "../devices";
import type { ShiftPattern } from "./shifts";

export type UnitSummary = {
  id: number;
  code: string;
  name: string;
  kind: "icu" | "ward";
  altitudeM: number;
  timeZone: string;
};

/** A unit with its day-to-day settings (shifts, devices, fallback address). */
export type UnitDetail = UnitSummary &
  ShiftPattern & {
    allowedDevices: Device[];
    fallbackEmail: string | null;
    active: boolean;
    version: number;
  };

type UnitRow = {
  id: number;
  code: string;
  name: string;
  kind: "icu" | "ward";
  altitude_m: number;
  time_zone: string;
  shift_start: string;
  shift_hours: number;
  devices_json: string | null;
  fallback_email: string | null;
  active: number | boolean;
  version: number;
};

const UNIT_COLUMNS = [
  "id",
  "code",
  "name",
  "kind",
  "altitude_m",
  "time_zone",
  "shift_start",
  "shift_hours",
  "devices_json",
  "fallback_email",
  "active",
  "version",
] as const;

/** Stored device lists are read strictly: unknown codes are dropped, none stored means all. */
export function parseDevices(json: string | null): Device[] {
  if (json === null) return [...DEVICES];
  const list = JSON.parse(json) as unknown;
  return Array.isArray(list) ? DEVICES.filter((d) => list.includes(d)) : [...DEVICES];
}

function unitDetail(r: UnitRow): UnitDetail {
  return {
    id: r.id,
    code: r.code,
    name: r.name,
    kind: r.kind,
    altitudeM: r.altitude_m,
    timeZone: r.time_zone,
    shiftStart: r.shift_start,
    shiftHours: r.shift_hours as ShiftPattern["shiftHours"],
    allowedDevices: parseDevices(r.devices_json),
    fallbackEmail: r.fallback_email,
    active: Boolean(r.active),
    version: r.version,
  };
}

function unitSummary(d: UnitDetail): UnitSummary {
  return {
    id: d.id,
    code: d.code,
    name: d.name,
    kind: d.kind,
    altitudeM: d.altitudeM,
    timeZone: d.timeZone,
  };
}

export async function listUnits(knex: Knex, onlyIds?: readonly number[]): Promise<UnitSummary[]> {
  return (await listUnitDetails(knex, { onlyIds })).map(unitSummary);
}

/** Units with their settings; retired units only when asked. */
export async function listUnitDetails(
  knex: Knex,
  opts: { onlyIds?: readonly number[]; includeRetired?: boolean } = {},
): Promise<UnitDetail[]> {
  const q = knex("units").orderBy("code");
  if (!opts.includeRetired) q.where({ active: true });
  if (opts.onlyIds) q.whereIn("id", opts.onlyIds);
  return ((await q.select(...UNIT_COLUMNS)) as UnitRow[]).map(unitDetail);
}

export async function getUnit(knex: Knex, id: number): Promise<UnitDetail | null> {
  const row = (await knex("units")
    .where({ id })
    .first(...UNIT_COLUMNS)) as UnitRow | undefined;
  return row ? unitDetail(row) : null;
}

export type BedView = {
  id: number;
  unitId: number;
  label: string;
  sortOrder: number;
  active: boolean;
  /** The patient in the bed now, if any. */
  occupant: { patientId: number; admissionId: number; name: string; mrn: string } | null;
};

/** A unit's beds in their order, with who is in each. */
export async function listBeds(
  knex: Knex,
  unitId: number,
  opts: { includeRetired?: boolean } = {},
): Promise<BedView[]> {
  const q = knex("beds as b")
    .leftJoin("admissions as a", function () {
      this.on("a.bed_id", "b.id").andOnNull("a.discharged_at");
    })
    .leftJoin("patients as p", "p.id", "a.patient_id")
    .where("b.unit_id", unitId)
    .orderBy([{ column: "b.sort_order" }, { column: "b.label" }]);
  if (!opts.includeRetired) q.where("b.active", true);
  const rows = (await q.select(
    "b.id",
    "b.unit_id",
    "b.label",
    "b.sort_order",
    "b.active",
    "a.id as admission_id",
    "p.id as patient_id",
    "p.given_name",
    "p.family_name",
    "p.mrn",
  )) as {
    id: number;
    unit_id: number;
    label: string;
    sort_order: number;
    active: number | boolean;
    admission_id: number | null;
    patient_id: number | null;
    given_name: string | null;
    family_name: string | null;
    mrn: string | null;
  }[];
  return rows.map((r) => ({
    id: r.id,
    unitId: r.unit_id,
    label: r.label,
    sortOrder: r.sort_order,
    active: Boolean(r.active),
    occupant:
      r.patient_id !== null && r.admission_id !== null
        ? {
            patientId: r.patient_id,
            admissionId: r.admission_id,
            name: `${r.family_name}, ${r.given_name}`,
            mrn: r.mrn!,
          }
        : null,
  }));
}

/** A bed with nobody in it, with its unit's name, clock and allowed devices. */
export type FreeBedView = {
  id: number;
  label: string;
  unitId: number;
  unitCode: string;
  unitName: string;
  timeZone: string;
  allowedDevices: Device[];
};

/** The free, active beds of the given units, by unit and bed order. */
export async function listFreeBeds(knex: Knex, unitIds: readonly number[]): Promise<FreeBedView[]> {
  if (unitIds.length === 0) return [];
  const units = await listUnitDetails(knex, { onlyIds: unitIds });
  const out: FreeBedView[] = [];
  for (const unit of units) {
    for (const bed of await listBeds(knex, unit.id)) {
      if (bed.occupant) continue;
      out.push({
        id: bed.id,
        label: bed.label,
        unitId: unit.id,
        unitCode: unit.code,
        unitName: unit.name,
        timeZone: unit.timeZone,
        allowedDevices: unit.allowedDevices,
      });
    }
  }
  return out;
}

/** A unit on the admin pages: its settings with how many beds it has and how many are occupied. */
export type UnitOverview = UnitDetail & { beds: number; occupiedBeds: number; retiredBeds: number };

/** The given units with their bed counts (retired units too, so an admin can still see them). */
export async function listUnitOverviews(
  knex: Knex,
  onlyIds: readonly number[],
): Promise<UnitOverview[]> {
  if (onlyIds.length === 0) return [];
  const units = await listUnitDetails(knex, { onlyIds, includeRetired: true });
  const counts = (await knex("beds as b")
    .leftJoin("admissions as a", function () {
      this.on("a.bed_id", "b.id").andOnNull("a.discharged_at");
    })
    .whereIn("b.unit_id", onlyIds)
    .groupBy("b.unit_id")
    .select("b.unit_id")
    .select(knex.raw("SUM(b.active = 1) AS beds"))
    .select(knex.raw("SUM(b.active = 0) AS retired"))
    .select(knex.raw("COUNT(a.id) AS occupied"))) as {
    unit_id: number;
    beds: number | string | null;
    retired: number | string | null;
    occupied: number | string;
  }[];
  const byUnit = new Map(counts.map((c) => [c.unit_id, c]));
  return units.map((u) => {
    const c = byUnit.get(u.id);
    return {
      ...u,
      beds: Number(c?.beds ?? 0),
      retiredBeds: Number(c?.retired ?? 0),
      occupiedBeds: Number(c?.occupied ?? 0),
    };
  });
}

/** A patient whose order in effect uses a device the unit no longer allows. */
export type DeviceWarning = {
  patientId: number;
  mrn: string;
  name: string;
  bedLabel: string;
  device: Device;
};

/** Orders in effect (active or awaiting co-signature) on the unit's beds with a device outside `allowed`. */
export async function ordersOutsideDevices(
  knex: Knex,
  unitId: number,
  allowed: readonly Device[],
): Promise<DeviceWarning[]> {
  const rows = (await knex("orders as o")
    .join("admissions as a", "a.id", "o.admission_id")
    .join("beds as b", "b.id", "a.bed_id")
    .join("patients as p", "p.id", "o.patient_id")
    .where("b.unit_id", unitId)
    .whereNull("a.discharged_at")
    .whereIn("o.status", ["active", "awaiting_cosign"])
    .whereNotIn("o.device", allowed.length ? [...allowed] : [""])
    .orderBy([{ column: "b.sort_order" }, { column: "b.label" }])
    .select(
      "p.id as patient_id",
      "p.mrn",
      "p.given_name",
      "p.family_name",
      "b.label",
      "o.device",
    )) as {
    patient_id: number;
    mrn: string;
    given_name: string;
    family_name: string;
    label: string;
    device: Device;
  }[];
  return rows.map((r) => ({
    patientId: r.patient_id,
    mrn: r.mrn,
    name: `${r.family_name}, ${r.given_name}`,
    bedLabel: r.label,
    device: r.device,
  }));
}

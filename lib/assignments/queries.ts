import type { Knex } from "knex";
import type { Actor } from "../auth/actor";
import { initialsOf } from "../admissions/display";
import { NotFoundError, ValidationError } from "../errors";
import { getUnit, type UnitDetail } from "../units/queries";
import { resolveShift, shiftAt, nextShift, previousShift, type Shift } from "../units/shifts";
import type { FilledCell, StaffMember } from "./copy";
import { assignWords, mayAssign, placeOf, type ShiftPlace } from "./may-assign";
import { DUTIES, type AssignmentReadData, type Duty } from "./schema";

export type AssignedPerson = { userId: number; name: string };

export type GridBed = {
  id: number;
  label: string;
  occupant: { patientId: number; initials: string } | null;
  cells: Record<Duty, AssignedPerson | null>;
};

export type AssignmentGrid = {
  unit: { id: number; code: string; name: string };
  shift: { startsAt: string; endsAt: string; place: ShiftPlace };
  /** The unit's previous, current and next shift starts, for the chooser. */
  shifts: { previous: string; current: string; next: string };
  beds: GridBed[];
  charge: AssignedPerson | null;
  candidates: Record<Duty, { id: number; name: string }[]>;
  /** The shift before this one, for "Copy from previous shift". */
  previous: { chargeNurseId: number | null; cells: FilledCell[] };
  editable: boolean;
  /** Who may edit and why, or why not. */
  editWhy: string;
};

/** The unit, if the actor belongs to it; another unit's answers 404. */
export async function unitForActor(knex: Knex, actor: Actor, unitId: number): Promise<UnitDetail> {
  const unit = actor.unitIds.includes(unitId) ? await getUnit(knex, unitId) : null;
  if (!unit || !unit.active) throw new NotFoundError("That unit does not exist.");
  return unit;
}

function patternWords(unit: UnitDetail): string {
  return `${unit.code} shifts start at ${unit.shiftStart} (${unit.timeZone}) every ${unit.shiftHours} h`;
}

/** "current", "next", "previous" or a start → the unit's shift; 400 naming `shift` otherwise. */
export function unitShift(
  unit: UnitDetail,
  which: "current" | "next" | "previous" | Date,
  now: Date,
): Shift {
  const shift = resolveShift(unit, which, now);
  if (!shift) {
    const words = `Shift ${which instanceof Date ? which.toISOString() : String(which)} is not a shift start of ${unit.code}: ${patternWords(unit)}.`;
    throw new ValidationError(words, { shift: [words] });
  }
  return shift;
}

export function shiftPlace(unit: UnitDetail, shift: Shift, now: Date): ShiftPlace {
  const current = shiftAt(unit, now);
  return placeOf(shift.startsAt, current, nextShift(unit, current));
}

/** Active users of the unit who can hold a duty (nurses, therapists, physicians), by name. */
export async function unitStaff(knex: Knex, unitId: number): Promise<StaffMember[]> {
  return (await knex("users as u")
    .join("user_units as uu", "uu.user_id", "u.id")
    .where({ "uu.unit_id": unitId, "u.active": true })
    .whereIn("u.role", DUTIES)
    .orderBy("u.name")
    .select("u.id", "u.name", "u.role")) as StaffMember[];
}

type BedRow = {
  id: number;
  label: string;
  patient_id: number | null;
  given_name: string | null;
  family_name: string | null;
};

/** The unit's active beds in order, with the initials of who is in each. */
export async function activeBeds(knex: Knex, unitId: number) {
  const rows = (await knex("beds as b")
    .leftJoin("admissions as a", function () {
      this.on("a.bed_id", "b.id").andOnNull("a.discharged_at");
    })
    .leftJoin("patients as p", "p.id", "a.patient_id")
    .where({ "b.unit_id": unitId, "b.active": true })
    .orderBy([{ column: "b.sort_order" }, { column: "b.label" }])
    .select("b.id", "b.label", "p.id as patient_id", "p.given_name", "p.family_name")) as BedRow[];
  return rows.map((r) => ({
    id: r.id,
    label: r.label,
    occupant:
      r.patient_id !== null
        ? { patientId: r.patient_id, initials: initialsOf(r.given_name!, r.family_name!) }
        : null,
  }));
}

/** The assignments of one shift of a unit (any bed of the unit, retired ones too). */
export async function shiftAssignments(
  knex: Knex,
  unitId: number,
  startsAt: Date,
): Promise<{ cells: FilledCell[]; chargeNurseId: number | null }> {
  const [cells, charge] = await Promise.all([
    knex("care_assignments as c")
      .join("beds as b", "b.id", "c.bed_id")
      .where({ "b.unit_id": unitId, "c.starts_at": startsAt })
      .orderBy(["c.bed_id", "c.duty"])
      .select("c.bed_id as bedId", "c.duty", "c.user_id as userId") as Promise<FilledCell[]>,
    knex("unit_charge_duties")
      .where({ unit_id: unitId, starts_at: startsAt })
      .first("user_id") as Promise<{ user_id: number } | undefined>,
  ]);
  return { cells, chargeNurseId: charge?.user_id ?? null };
}

/** Whether the user holds the unit's charge duty for the shift that contains `now`. */
export async function holdsCurrentCharge(
  knex: Knex,
  unit: UnitDetail,
  userId: number,
  now: Date,
): Promise<boolean> {
  const current = shiftAt(unit, now);
  const row = (await knex("unit_charge_duties")
    .where({ unit_id: unit.id, starts_at: current.startsAt, user_id: userId })
    .first("id")) as { id: number } | undefined;
  return row !== undefined;
}

async function names(knex: Knex, ids: number[]): Promise<Map<number, string>> {
  if (ids.length === 0) return new Map();
  const rows = (await knex("users").whereIn("id", ids).select("id", "name")) as {
    id: number;
    name: string;
  }[];
  return new Map(rows.map((r) => [r.id, r.name]));
}

/** The grid of one shift: beds × duties → who, the charge nurse, the candidates and who may edit. */
export async function getAssignmentGrid(
  knex: Knex,
  actor: Actor,
  input: AssignmentReadData,
  now: Date = new Date(),
): Promise<AssignmentGrid> {
  const unit = await unitForActor(knex, actor, input.unitId);
  const shift = unitShift(unit, input.shift, now);
  const current = shiftAt(unit, now);
  const place = shiftPlace(unit, shift, now);
  const [beds, staff, assigned, previous, isCharge] = await Promise.all([
    activeBeds(knex, unit.id),
    unitStaff(knex, unit.id),
    shiftAssignments(knex, unit.id, shift.startsAt),
    shiftAssignments(knex, unit.id, previousShift(unit, shift).startsAt),
    holdsCurrentCharge(knex, unit, actor.id, now),
  ]);
  const people = await names(knex, [
    ...assigned.cells.map((c) => c.userId),
    ...(assigned.chargeNurseId !== null ? [assigned.chargeNurseId] : []),
  ]);
  const person = (userId: number | null | undefined): AssignedPerson | null =>
    userId == null ? null : { userId, name: people.get(userId) ?? `User ${userId}` };
  const decision = mayAssign({ role: actor.role, isCurrentCharge: isCharge, place });
  return {
    unit: { id: unit.id, code: unit.code, name: unit.name },
    shift: { startsAt: shift.startsAt.toISOString(), endsAt: shift.endsAt.toISOString(), place },
    shifts: {
      previous: previousShift(unit, current).startsAt.toISOString(),
      current: current.startsAt.toISOString(),
      next: nextShift(unit, current).startsAt.toISOString(),
    },
    beds: beds.map((b) => {
      const of = (duty: Duty) =>
        person(assigned.cells.find((c) => c.bedId === b.id && c.duty === duty)?.userId);
      return {
        ...b,
        cells: { nurse: of("nurse"), therapist: of("therapist"), physician: of("physician") },
      };
    }),
    charge: person(assigned.chargeNurseId),
    candidates: {
      nurse: staff.filter((s) => s.role === "nurse").map(({ id, name }) => ({ id, name })),
      therapist: staff.filter((s) => s.role === "therapist").map(({ id, name }) => ({ id, name })),
      physician: staff.filter((s) => s.role === "physician").map(({ id, name }) => ({ id, name })),
    },
    previous,
    editable: decision.allowed,
    editWhy: assignWords(decision),
  };
}

export type MyBed = {
  unitId: number;
  unitCode: string;
  bedId: number;
  bedLabel: string;
  duty: Duty;
  endsAt: string;
  patient: { id: number; name: string; initials: string } | null;
};

/** The beds assigned to a user in the shift running now, on any of their units. */
export async function myBeds(knex: Knex, actor: Actor, now: Date = new Date()): Promise<MyBed[]> {
  const rows = (await knex("care_assignments as c")
    .join("beds as b", "b.id", "c.bed_id")
    .join("units as u", "u.id", "b.unit_id")
    .leftJoin("admissions as a", function () {
      this.on("a.bed_id", "b.id").andOnNull("a.discharged_at");
    })
    .leftJoin("patients as p", "p.id", "a.patient_id")
    .where("c.user_id", actor.id)
    .whereIn("b.unit_id", actor.unitIds.length ? actor.unitIds : [0])
    .andWhere("c.starts_at", "<=", now)
    .andWhere("c.ends_at", ">", now)
    .orderBy([
      { column: "u.code" },
      { column: "b.sort_order" },
      { column: "b.label" },
      { column: "c.duty" },
    ])
    .select(
      "u.id as unit_id",
      "u.code as unit_code",
      "b.id as bed_id",
      "b.label as bed_label",
      "c.duty",
      "c.ends_at",
      "p.id as patient_id",
      "p.given_name",
      "p.family_name",
    )) as {
    unit_id: number;
    unit_code: string;
    bed_id: number;
    bed_label: string;
    duty: Duty;
    ends_at: Date;
    patient_id: number | null;
    given_name: string | null;
    family_name: string | null;
  }[];
  return rows.map((r) => ({
    unitId: r.unit_id,
    unitCode: r.unit_code,
    bedId: r.bed_id,
    bedLabel: r.bed_label,
    duty: r.duty,
    endsAt: new Date(r.ends_at).toISOString(),
    patient:
      r.patient_id !== null
        ? {
            id: r.patient_id,
            name: `${r.family_name}, ${r.given_name}`,
            initials: initialsOf(r.given_name!, r.family_name!),
          }
        : null,
  }));
}

import type { Knex } from "knex";
import type { Actor } from "../auth/actor";
import { ForbiddenError, ValidationError, type FieldErrors } from "../errors";
import { once } from "../idempotency";
import { appendLedger, type LedgerActor } from "../ledger/service";
import { previousShift, type Shift } from "../units/shifts";
import { cellKey, cellsToCopy, chargeToCopy, fitsDuty, type StaffMember } from "./copy";
import { getUnit, type UnitDetail } from "../units/queries";
import { mayAssign, ONLY_CHARGE_OR_ADMIN } from "./may-assign";
import {
  activeBeds,
  getAssignmentGrid,
  holdsCurrentCharge,
  shiftAssignments,
  shiftPlace,
  unitForActor,
  unitShift,
  unitStaff,
  type AssignmentGrid,
} from "./queries";
import type { AssignmentWriteData, Duty } from "./schema";

type CellChange = { bedId: number; duty: Duty; userId: number | null };
export type ShiftChanges = { chargeNurseId?: number | null; cells: CellChange[] };

/** The ledger's entity id of a unit's shift. */
export const shiftEntityId = (unitId: number, startsAt: Date) =>
  `${unitId}:${startsAt.toISOString()}`;

/** Takes the unit row's lock, so two writers of one unit's shifts never interleave. */
export async function lockUnit(trx: Knex.Transaction, unitId: number): Promise<void> {
  await trx("units").where({ id: unitId }).forUpdate().first("id");
}

/**
 * Writes the given cells and charge nurse of one shift and returns what changed,
 * before and after. Checks nothing about who asks; the callers do.
 */
export async function writeShift(
  trx: Knex.Transaction,
  unitId: number,
  shift: Shift,
  wanted: ShiftChanges,
): Promise<{ before: ShiftChanges; after: ShiftChanges }> {
  const current = await shiftAssignments(trx, unitId, shift.startsAt);
  const held = new Map(current.cells.map((c) => [cellKey(c.bedId, c.duty), c.userId]));
  const before: ShiftChanges = { cells: [] };
  const after: ShiftChanges = { cells: [] };
  for (const cell of wanted.cells) {
    const was = held.get(cellKey(cell.bedId, cell.duty)) ?? null;
    if (was === cell.userId) continue;
    const where = { bed_id: cell.bedId, duty: cell.duty, starts_at: shift.startsAt };
    if (cell.userId === null) await trx("care_assignments").where(where).delete();
    else if (was === null)
      await trx("care_assignments").insert({
        ...where,
        user_id: cell.userId,
        ends_at: shift.endsAt,
      });
    else await trx("care_assignments").where(where).update({ user_id: cell.userId });
    before.cells.push({ bedId: cell.bedId, duty: cell.duty, userId: was });
    after.cells.push(cell);
  }
  if (wanted.chargeNurseId !== undefined && wanted.chargeNurseId !== current.chargeNurseId) {
    const where = { unit_id: unitId, starts_at: shift.startsAt };
    if (wanted.chargeNurseId === null) await trx("unit_charge_duties").where(where).delete();
    else if (current.chargeNurseId === null)
      await trx("unit_charge_duties").insert({
        ...where,
        user_id: wanted.chargeNurseId,
        ends_at: shift.endsAt,
      });
    else await trx("unit_charge_duties").where(where).update({ user_id: wanted.chargeNurseId });
    before.chargeNurseId = current.chargeNurseId;
    after.chargeNurseId = wanted.chargeNurseId;
  }
  return { before, after };
}

/** What copying `source` into the target's empty cells (and empty charge duty) would write. */
export async function copyChanges(
  trx: Knex.Transaction,
  unitId: number,
  source: Date,
  target: Date,
  staff: StaffMember[],
): Promise<ShiftChanges> {
  const [from, to, beds] = await Promise.all([
    shiftAssignments(trx, unitId, source),
    shiftAssignments(trx, unitId, target),
    activeBeds(trx, unitId),
  ]);
  const cells = cellsToCopy({
    source: from.cells,
    target: to.cells,
    bedIds: beds.map((b) => b.id),
    staff,
  });
  const charge = chargeToCopy({ source: from.chargeNurseId, target: to.chargeNurseId, staff });
  return { cells, ...(charge !== null ? { chargeNurseId: charge } : {}) };
}

/** Each cell checked against the unit: an active bed, an active user of the duty's role. */
async function checkCells(
  trx: Knex.Transaction,
  unit: UnitDetail,
  input: AssignmentWriteData,
  staff: StaffMember[],
): Promise<void> {
  const beds = new Map((await activeBeds(trx, unit.id)).map((b) => [b.id, b.label]));
  const errors: FieldErrors = {};
  const seen = new Set<string>();
  input.cells.forEach((cell, i) => {
    const label = beds.get(cell.bedId);
    if (label === undefined) {
      errors[`cells.${i}.bedId`] = [`Bed ${cell.bedId} is not an active bed of ${unit.code}.`];
      return;
    }
    const key = cellKey(cell.bedId, cell.duty);
    if (seen.has(key)) {
      errors[`cells.${i}.duty`] = [`${label} ${cell.duty} is given twice; give each cell once.`];
      return;
    }
    seen.add(key);
    if (cell.userId !== null && !fitsDuty(staff, cell.userId, cell.duty)) {
      errors[`cells.${i}.userId`] = [
        `${label} ${cell.duty}: user ${cell.userId} is not an active ${cell.duty} of ${unit.code}.`,
      ];
    }
  });
  if (
    input.chargeNurseId !== undefined &&
    input.chargeNurseId !== null &&
    !fitsDuty(staff, input.chargeNurseId, "nurse")
  ) {
    errors.chargeNurseId = [
      `Charge nurse: user ${input.chargeNurseId} is not an active nurse of ${unit.code}.`,
    ];
  }
  const first = Object.values(errors)[0]?.[0];
  if (first) throw new ValidationError(first, errors);
}

function merge(a: ShiftChanges, b: ShiftChanges): ShiftChanges {
  return {
    cells: [...a.cells, ...b.cells],
    ...(b.chargeNurseId !== undefined
      ? { chargeNurseId: b.chargeNurseId }
      : a.chargeNurseId !== undefined
        ? { chargeNurseId: a.chargeNurseId }
        : {}),
  };
}

/** Appends the shift's "assignment.set" row (admin chain, with the unit). */
export async function ledgerShift(
  trx: Knex.Transaction,
  actor: LedgerActor,
  unitId: number,
  shift: Shift,
  change: { before: ShiftChanges; after: ShiftChanges },
  rationale: string | null,
  now: Date,
): Promise<void> {
  await appendLedger(
    trx,
    actor,
    {
      action: "assignment.set",
      entityType: "shift",
      entityId: shiftEntityId(unitId, shift.startsAt),
      unitId,
      before: change.before,
      after: { ...change.after, endsAt: shift.endsAt.toISOString() },
      rationale,
    },
    now,
  );
}

export type AssignmentWriteResult = { grid: AssignmentGrid; changed: number };

/**
 * Sets the given cells (and charge nurse) of the current or next shift, then
 * — asked to — fills the still-empty cells from the previous shift. One
 * transaction under the unit's lock, one ledger row with the changed cells.
 */
export async function setAssignments(
  knex: Knex,
  actor: Actor,
  input: AssignmentWriteData,
  now: Date = new Date(),
): Promise<AssignmentWriteResult> {
  // A nurse who is not the unit's charge nurse now is refused alike for every unit, hers or
  // not, existing or not (403, leaking nothing); for admins another unit's answers 404.
  if (actor.role !== "admin") {
    const known = await getUnit(knex, input.unitId);
    const charge =
      known !== null &&
      actor.unitIds.includes(known.id) &&
      (await holdsCurrentCharge(knex, known, actor.id, now));
    if (!charge) throw new ForbiddenError(ONLY_CHARGE_OR_ADMIN);
  }
  const unit = await unitForActor(knex, actor, input.unitId);
  const shift = unitShift(unit, input.shift, now);
  const changed = await once(
    knex,
    actor.id,
    input.idempotencyKey,
    "assignment.set",
    async (trx) => {
      await lockUnit(trx, unit.id);
      const decision = mayAssign({
        role: actor.role,
        isCurrentCharge: await holdsCurrentCharge(trx, unit, actor.id, now),
        place: shiftPlace(unit, shift, now),
      });
      if (!decision.allowed) {
        if (decision.status === 403) throw new ForbiddenError(decision.reason);
        throw new ValidationError(decision.reason, { shift: [decision.reason] });
      }
      const staff = await unitStaff(trx, unit.id);
      await checkCells(trx, unit, input, staff);
      const given: ShiftChanges = {
        cells: input.cells,
        ...(input.chargeNurseId !== undefined ? { chargeNurseId: input.chargeNurseId } : {}),
      };
      let change = await writeShift(trx, unit.id, shift, given);
      if (input.copyFrom === "previous") {
        const source = previousShift(unit, shift).startsAt;
        const copied = await copyChanges(trx, unit.id, source, shift.startsAt, staff);
        const more = await writeShift(trx, unit.id, shift, copied);
        change = {
          before: merge(change.before, more.before),
          after: merge(change.after, more.after),
        };
      }
      const count = change.after.cells.length + (change.after.chargeNurseId !== undefined ? 1 : 0);
      if (count > 0) {
        const rationale = input.copyFrom ? "Filled empty cells from the previous shift" : null;
        await ledgerShift(trx, actor, unit.id, shift, change, rationale, now);
      }
      return count;
    },
  );
  return {
    grid: await getAssignmentGrid(knex, actor, { unitId: unit.id, shift: shift.startsAt }, now),
    changed,
  };
}

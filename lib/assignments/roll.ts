import type { Knex } from "knex";
import { SYSTEM_ACTOR } from "../ledger/service";
import { listUnitDetails, type UnitDetail } from "../units/queries";
import { nextShift, shiftAt, type Shift } from "../units/shifts";
import { shiftAssignments, unitStaff } from "./queries";
import { copyChanges, ledgerShift, lockUnit, writeShift } from "./service";
import { transact } from "../transaction";

const DAY_MS = 86_400_000;

export type RolledShift = { unitId: number; startsAt: string; from: string; cells: number };

/** Whether a shift of the unit has any assignment or charge duty. */
async function hasAssignments(knex: Knex, unitId: number, startsAt: Date): Promise<boolean> {
  const rows = await shiftAssignments(knex, unitId, startsAt);
  return rows.cells.length > 0 || rows.chargeNurseId !== null;
}

/**
 * The shift to copy: the one exactly 24 h earlier (same time of day, so day
 * shifts copy day shifts) if it has rows, else the latest earlier one that has.
 */
async function sourceFor(knex: Knex, unitId: number, target: Date): Promise<Date | null> {
  const dayBefore = new Date(target.getTime() - DAY_MS);
  if (await hasAssignments(knex, unitId, dayBefore)) return dayBefore;
  const [cell, charge] = await Promise.all([
    knex("care_assignments as c")
      .join("beds as b", "b.id", "c.bed_id")
      .where("b.unit_id", unitId)
      .andWhere("c.starts_at", "<", target)
      .max({ at: "c.starts_at" })
      .first() as Promise<{ at: Date | null } | undefined>,
    knex("unit_charge_duties")
      .where("unit_id", unitId)
      .andWhere("starts_at", "<", target)
      .max({ at: "starts_at" })
      .first() as Promise<{ at: Date | null } | undefined>,
  ]);
  const times = [cell?.at, charge?.at].filter((t): t is Date => t != null).map((t) => new Date(t));
  return times.length ? new Date(Math.max(...times.map((t) => t.getTime()))) : null;
}

async function rollShift(
  knex: Knex,
  unit: UnitDetail,
  shift: Shift,
  now: Date,
): Promise<RolledShift | null> {
  return transact(knex, async (trx) => {
    await lockUnit(trx, unit.id);
    // Checked under the lock: a second run, or a writer first, leaves the shift alone.
    if (await hasAssignments(trx, unit.id, shift.startsAt)) return null;
    const source = await sourceFor(trx, unit.id, shift.startsAt);
    if (!source) return null;
    const staff = await unitStaff(trx, unit.id);
    const copied = await copyChanges(trx, unit.id, source, shift.startsAt, staff);
    const change = await writeShift(trx, unit.id, shift, copied);
    if (change.after.cells.length === 0 && change.after.chargeNurseId === undefined) return null;
    await ledgerShift(
      trx,
      SYSTEM_ACTOR,
      unit.id,
      shift,
      change,
      `Rolled forward from ${source.toISOString()}`,
      now,
    );
    return {
      unitId: unit.id,
      startsAt: shift.startsAt.toISOString(),
      from: source.toISOString(),
      cells: change.after.cells.length,
    };
  });
}

/**
 * Brings assignments forward so the current and next shift of every active
 * unit have some: a shift with none at all gets a copy of an earlier one
 * (still-active people and beds only), its charge duty included. Idempotent;
 * one transaction and one ledger row (the system's) per shift written.
 */
export async function rollAssignments(knex: Knex, now: Date = new Date()): Promise<RolledShift[]> {
  const rolled: RolledShift[] = [];
  for (const unit of await listUnitDetails(knex)) {
    const current = shiftAt(unit, now);
    for (const shift of [current, nextShift(unit, current)]) {
      const done = await rollShift(knex, unit, shift, now);
      if (done) rolled.push(done);
    }
  }
  return rolled;
}

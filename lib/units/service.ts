import type { Knex } from "knex";
import type { Actor } from "../auth/actor";
import { assertUnitAccess } from "../auth/actor-queries";
import { duplicateIndex } from "../db-errors";
import { ConflictError, NotFoundError } from "../errors";
import { once } from "../idempotency";
import { appendLedger } from "../ledger/service";
import {
  getUnit,
  listBeds,
  ordersOutsideDevices,
  type BedView,
  type DeviceWarning,
  type UnitDetail,
} from "./queries";
import type { BedCreateData, BedUpdateData, UnitCreateData, UnitUpdateData } from "./schema";
import { transact } from "../transaction";

// Units and beds, administered by admins of the unit (actor.unitIds): another
// unit answers 404 like every other record. Admin writes chain to the "admin"
// ledger chain with the unit named.

/** What the ledger records of a unit. */
function unitView(u: UnitDetail) {
  return {
    code: u.code,
    name: u.name,
    kind: u.kind,
    altitudeM: u.altitudeM,
    timeZone: u.timeZone,
    shiftStart: u.shiftStart,
    shiftHours: u.shiftHours,
    allowedDevices: u.allowedDevices,
    fallbackEmail: u.fallbackEmail,
    version: u.version,
  };
}

function bedView(b: BedView) {
  return { label: b.label, sortOrder: b.sortOrder, active: b.active };
}

function unitColumns(input: UnitCreateData | UnitUpdateData) {
  return {
    name: input.name,
    kind: input.kind,
    altitude_m: input.altitudeM,
    time_zone: input.timeZone,
    shift_start: input.shiftStart,
    shift_hours: input.shiftHours,
    devices_json: JSON.stringify(input.allowedDevices),
    fallback_email: input.fallbackEmail || null,
  };
}

function duplicateCode(code: string): ConflictError {
  const message = `A unit with the code ${code} already exists; choose another code.`;
  return new ConflictError(message, { code: [message] });
}

function duplicateLabel(label: string, unitCode: string, retired: boolean): ConflictError {
  const message = retired
    ? `${unitCode} already has a retired bed ${label}; restore it instead, or choose another label.`
    : `${unitCode} already has a bed ${label}; choose another label.`;
  return new ConflictError(message, { label: [message] });
}

/** Initial beds are numbered 1, 2, 3… in their order. */
const initialLabels = (n: number) => Array.from({ length: n }, (_, i) => String(i + 1));

/**
 * Creates a unit with its first beds, and makes the creating admin a member of
 * it, so they can act on it at once — one transaction with its ledger row.
 */
export async function createUnit(
  knex: Knex,
  actor: Actor,
  input: UnitCreateData,
): Promise<UnitDetail> {
  try {
    return await once(knex, actor.id, input.idempotencyKey, "unit.create", async (trx) => {
      const taken = (await trx("units").where({ code: input.code }).first("id")) as
        { id: number } | undefined;
      if (taken) throw duplicateCode(input.code);
      const [id] = await trx("units").insert({ code: input.code, ...unitColumns(input) });
      const unitId = Number(id);
      await trx("user_units").insert({ user_id: actor.id, unit_id: unitId });
      const labels = initialLabels(input.initialBeds);
      if (labels.length) {
        await trx("beds").insert(
          labels.map((label, i) => ({ unit_id: unitId, label, sort_order: i + 1 })),
        );
      }
      const created = (await getUnit(trx, unitId))!;
      await appendLedger(trx, actor, {
        action: "unit.create",
        entityType: "unit",
        entityId: unitId,
        unitId,
        after: { ...unitView(created), beds: labels, members: [actor.id] },
        rationale: input.rationale || null,
      });
      return created;
    });
  } catch (error) {
    // Two admins creating the same code at once: the unique index decides.
    if (duplicateIndex(error) === "units_code_unique") throw duplicateCode(input.code);
    throw error;
  }
}

export type UnitUpdateResult = {
  unit: UnitDetail;
  /** Patients whose order in effect uses a device the unit no longer allows (not a refusal). */
  warnings: DeviceWarning[];
};

/** Edits a unit's settings (not its code); refuses a stale version. */
export async function updateUnit(
  knex: Knex,
  actor: Actor,
  input: UnitUpdateData,
): Promise<UnitUpdateResult> {
  assertUnitAccess(actor, input.unitId);
  return transact(knex, async (trx) => {
    const locked = (await trx("units").where({ id: input.unitId }).forUpdate().first("version")) as
      { version: number } | undefined;
    if (!locked) throw new NotFoundError();
    const before = (await getUnit(trx, input.unitId))!;
    if (locked.version !== input.version) {
      throw new ConflictError(
        `${before.code} was changed by someone else while you were editing. Reload to see the current settings, then apply your change again.`,
      );
    }
    await trx("units")
      .where({ id: input.unitId })
      .update({ ...unitColumns(input), version: before.version + 1 });
    const after = (await getUnit(trx, input.unitId))!;
    // Narrowing the devices is allowed: orders already in effect stay, and the answer names them.
    const warnings = await ordersOutsideDevices(trx, input.unitId, after.allowedDevices);
    await appendLedger(trx, actor, {
      action: "unit.update",
      entityType: "unit",
      entityId: input.unitId,
      unitId: input.unitId,
      before: unitView(before),
      after: {
        ...unitView(after),
        ...(warnings.length ? { ordersOutsideDevices: warnings.map((w) => w.patientId) } : {}),
      },
      rationale: input.rationale || null,
    });
    return { unit: after, warnings };
  });
}

/** The unit's row, locked so its beds change one writer at a time; 404 when it is not the actor's. */
async function lockUnit(trx: Knex.Transaction, actor: Actor, unitId: number): Promise<UnitDetail> {
  assertUnitAccess(actor, unitId);
  const row = (await trx("units").where({ id: unitId }).forUpdate().first("id")) as
    { id: number } | undefined;
  if (!row) throw new NotFoundError();
  return (await getUnit(trx, unitId))!;
}

async function findBed(
  trx: Knex.Transaction,
  unitId: number,
  bedId: number,
): Promise<BedView | undefined> {
  return (await listBeds(trx, unitId, { includeRetired: true })).find((b) => b.id === bedId);
}

async function assertLabelFree(
  trx: Knex.Transaction,
  unit: UnitDetail,
  label: string,
  exceptBedId?: number,
): Promise<void> {
  const q = trx("beds").where({ unit_id: unit.id, label });
  if (exceptBedId) q.whereNot({ id: exceptBedId });
  const other = (await q.first("active")) as { active: number | boolean } | undefined;
  if (other) throw duplicateLabel(label, unit.code, !other.active);
}

/** Adds a bed at the end of the unit's order. */
export async function createBed(knex: Knex, actor: Actor, input: BedCreateData): Promise<BedView> {
  // Checked before the transaction too, so another unit is a 404 even on a replayed key.
  assertUnitAccess(actor, input.unitId);
  return once(knex, actor.id, input.idempotencyKey, "bed.create", async (trx) => {
    const unit = await lockUnit(trx, actor, input.unitId);
    await assertLabelFree(trx, unit, input.label);
    const last = (await trx("beds")
      .where({ unit_id: unit.id })
      .max({ n: "sort_order" })
      .first()) as { n: number | null } | undefined;
    const [id] = await trx("beds").insert({
      unit_id: unit.id,
      label: input.label,
      sort_order: (last?.n ?? 0) + 1,
    });
    const bed = (await findBed(trx, unit.id, Number(id)))!;
    await appendLedger(trx, actor, {
      action: "bed.create",
      entityType: "bed",
      entityId: bed.id,
      unitId: unit.id,
      after: bedView(bed),
    });
    return bed;
  });
}

/** "Smith, Anna" → "A.S." */
function initials(name: string): string {
  const [family = "", given = ""] = name.split(", ");
  return `${given.charAt(0)}.${family.charAt(0)}.`.toUpperCase();
}

/**
 * Renames, retires or restores a bed. A bed with a patient in it cannot be
 * retired: the patient is discharged or moved first.
 */
export async function updateBed(knex: Knex, actor: Actor, input: BedUpdateData): Promise<BedView> {
  return transact(knex, async (trx) => {
    const unit = await lockUnit(trx, actor, input.unitId);
    const locked = (await trx("beds")
      .where({ id: input.bedId, unit_id: unit.id })
      .forUpdate()
      .first("id")) as { id: number } | undefined;
    if (!locked) throw new NotFoundError("That bed does not exist on this unit.");
    const before = (await findBed(trx, unit.id, input.bedId))!;
    const label = input.label ?? before.label;
    const active = input.active ?? before.active;
    if (label === before.label && active === before.active) return before;
    if (label !== before.label) await assertLabelFree(trx, unit, label, before.id);
    if (!active && before.occupant) {
      const who = `${initials(before.occupant.name)} (MRN ${before.occupant.mrn})`;
      const message = `Bed ${before.label} cannot be retired: ${who} is admitted to it. Discharge or transfer the patient first.`;
      throw new ConflictError(message, { active: [message] });
    }
    await trx("beds").where({ id: before.id }).update({ label, active });
    const after = (await findBed(trx, unit.id, before.id))!;
    await appendLedger(trx, actor, {
      action: "bed.update",
      entityType: "bed",
      entityId: before.id,
      unitId: unit.id,
      before: bedView(before),
      after: bedView(after),
    });
    return after;
  });
}

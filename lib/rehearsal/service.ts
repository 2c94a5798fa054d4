import { randomInt } from "node:crypto";
import type { Knex } from "knex";
import { assertUnitAccess } from "../auth/actor-queries";
import type { Actor } from "../auth/actor";
import { ConflictError, NotFoundError, ValidationError } from "../errors";
import { appendLedger } from "../ledger/service";
import { getStepTable, type StepTableView } from "../step-tables/queries";
import { orderStepsOf } from "../step-tables/steps";
import { DEFAULT_HFNC_OPTION } from "./labels";
import { defaultOrder } from "./parameters";
import { protocolOrders, protocolProblems, rehearsalParameters } from "./protocol";
import { getRehearsal, listRehearsals, type StoredSettings } from "./queries";
import { REHEARSAL_RANGES, type RehearsalCreateData, type RehearsalSettings } from "./schema";
import type { RehearsalListItem, RehearsalTableRef, RehearsalView } from "./views";
import { transact } from "../transaction";

/** The default high-flow ladder, as a run names it. */
export const DEFAULT_HFNC_LADDER: RehearsalTableRef = {
  id: null,
  name: DEFAULT_HFNC_OPTION,
  source: null,
  builtIn: true,
  rows: defaultOrder("hfnc").steps.length,
};

const tableRef = (t: StepTableView): RehearsalTableRef => ({
  id: t.id,
  name: t.name,
  source: t.source,
  builtIn: t.builtIn,
  rows: t.rows.length,
});

/**
 * How many runs a unit may have waiting or running: the queue is worked one
 * run at a time per process, so a unit cannot bury it.
 */
export const MAX_WAITING_PER_UNIT = 5;

/** A table the unit may rehearse: active, built-in or the unit's own, of the device's kind. */
async function usableTable(
  knex: Knex,
  id: number,
  unitId: number,
  kind: StepTableView["kind"],
  field: "ventilatedTableId" | "hfncTableId",
): Promise<StepTableView> {
  const table = await getStepTable(knex, id);
  const refuse = (message: string) =>
    new ValidationError("Some fields need attention.", { [field]: [message] });
  if (!table || !table.active || (table.unitId !== null && table.unitId !== unitId))
    throw refuse("That step table is not in the unit's library.");
  if (table.kind !== kind)
    throw refuse(
      kind === "fio2_peep"
        ? "Ventilated patients need an FiO2/PEEP table."
        : "High-flow patients need a flow/FiO2 table.",
    );
  return table;
}

/**
 * Asks for a run: the tables read and checked now (the stored parameters
 * carry their steps, so a later edit of a table cannot change the run), the
 * seed drawn if none was given, the row queued with its ledger row in one
 * transaction. A worker picks it up (lib/rehearsal/runner.ts).
 */
export async function requestRehearsal(
  knex: Knex,
  actor: Actor,
  input: RehearsalCreateData,
  now: Date = new Date(),
): Promise<RehearsalView> {
  assertUnitAccess(actor, input.unitId);
  const id = await transact(knex, async (trx) => {
    const waiting = (await trx("rehearsals")
      .where({ unit_id: input.unitId })
      .whereIn("status", ["queued", "running"])
      .count({ n: "*" })
      .first()) as { n: number | string };
    if (Number(waiting.n) >= MAX_WAITING_PER_UNIT)
      throw new ConflictError(
        `This unit already has ${MAX_WAITING_PER_UNIT} rehearsals waiting or running; ask again once one has finished.`,
      );
    const ventilated = await usableTable(
      trx,
      input.ventilatedTableId,
      input.unitId,
      "fio2_peep",
      "ventilatedTableId",
    );
    const hfnc =
      input.hfncTableId === null
        ? null
        : await usableTable(trx, input.hfncTableId, input.unitId, "flow_fio2", "hfncTableId");
    const settings: RehearsalSettings = {
      ...input,
      seed: input.seed ?? randomInt(REHEARSAL_RANGES.seed.min, REHEARSAL_RANGES.seed.max),
    };
    const orders = protocolOrders(settings, {
      ventilated: orderStepsOf(ventilated.rows),
      hfnc: hfnc ? orderStepsOf(hfnc.rows) : null,
    });
    const problems = protocolProblems(orders);
    if (problems.length)
      throw new ValidationError(
        "Some fields need attention.",
        Object.fromEntries(problems.map((p) => [p.field, [p.message]])),
      );
    const stored: StoredSettings = {
      settings,
      tables: {
        ventilated: tableRef(ventilated),
        hfnc: hfnc ? tableRef(hfnc) : DEFAULT_HFNC_LADDER,
      },
    };
    const [rehearsalId] = await trx("rehearsals").insert({
      unit_id: input.unitId,
      label: input.label,
      status: "queued",
      seed: settings.seed,
      patients: settings.patients,
      hours: settings.hours,
      settings_json: JSON.stringify(stored),
      parameters_json: JSON.stringify(rehearsalParameters(settings, orders)),
      requested_by: actor.id,
      created_at: now,
    });
    await appendLedger(
      trx,
      actor,
      {
        action: "rehearsal.request",
        entityType: "rehearsal",
        entityId: Number(rehearsalId),
        unitId: input.unitId,
        after: { label: input.label, ...stored },
      },
      now,
    );
    return Number(rehearsalId);
  });
  return (await getRehearsal(knex, id))!;
}

/** A run of one of the actor's units; another unit's answers 404, as its records do. */
export async function readRehearsal(
  knex: Knex,
  actor: Actor,
  rehearsalId: number,
): Promise<RehearsalView> {
  const run = await getRehearsal(knex, rehearsalId);
  if (!run) throw new NotFoundError("That rehearsal does not exist.");
  assertUnitAccess(actor, run.unitId);
  return run;
}

export async function readRehearsals(
  knex: Knex,
  actor: Actor,
  unitId: number,
): Promise<RehearsalListItem[]> {
  assertUnitAccess(actor, unitId);
  return listRehearsals(knex, unitId);
}

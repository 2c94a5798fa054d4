import { randomUUID } from "node:crypto";
import type { Knex } from "knex";
import type { Actor } from "../auth/actor";
import { ConflictError, NotFoundError, ValidationError } from "../errors";
import { appendLedger } from "../ledger/service";
import { getStepTable, type StepTableView } from "./queries";
import {
  type stepTableCreateSchema,
  type StepTableActiveData,
  type StepTableCreateData,
  type StepTableUpdateData,
} from "./schema";
import { transact } from "../transaction";

type Rows = ReturnType<typeof stepTableCreateSchema.parse>["rows"];

async function writeRows(trx: Knex.Transaction, tableId: number, rows: Rows): Promise<void> {
  await trx("step_table_rows").where({ step_table_id: tableId }).delete();
  await trx("step_table_rows").insert(
    rows.map((r, position) => ({
      step_table_id: tableId,
      position,
      fio2_min: r.fio2Min,
      fio2_max: r.fio2Max,
      peep_min_cmh2o: r.peepMin ?? null,
      peep_max_cmh2o: r.peepMin === undefined ? null : (r.peepMax ?? r.peepMin),
      flow_l_min: r.flow ?? null,
    })),
  );
}

async function assertUnit(trx: Knex.Transaction, unitId: number): Promise<void> {
  const unit = (await trx("units").where({ id: unitId, active: true }).first("id")) as
    { id: number } | undefined;
  if (!unit)
    throw new ValidationError("Some fields need attention.", {
      unitId: ["That unit does not exist or is inactive."],
    });
}

/** Creates a unit's own step table (admins only), with its ledger row. */
export async function createStepTable(
  knex: Knex,
  actor: Actor,
  input: StepTableCreateData,
): Promise<StepTableView> {
  return transact(knex, async (trx) => {
    await assertUnit(trx, input.unitId);
    const [id] = await trx("step_tables").insert({
      unit_id: input.unitId,
      code: `unit-${input.unitId}-${randomUUID().slice(0, 8)}`,
      name: input.name,
      kind: input.kind,
      source: input.source || null,
      built_in: false,
    });
    await writeRows(trx, Number(id), input.rows);
    const created = (await getStepTable(trx, Number(id)))!;
    await appendLedger(trx, actor, {
      action: "step_table.create",
      entityType: "step_table",
      entityId: created.id,
      unitId: input.unitId,
      after: created,
      rationale: input.rationale,
    });
    return created;
  });
}

async function lockEditable(
  trx: Knex.Transaction,
  id: number,
  version: number,
): Promise<StepTableView> {
  const row = (await trx("step_tables").where({ id }).forUpdate().first("version", "built_in")) as
    { version: number; built_in: number } | undefined;
  if (!row) throw new NotFoundError("That step table does not exist.");
  if (row.built_in) {
    throw new ValidationError(
      "Built-in published tables cannot be edited; create a unit table instead.",
      {
        name: ["Built-in published tables are read-only."],
      },
    );
  }
  const table = (await getStepTable(trx, id))!;
  if (row.version !== version) {
    throw new ConflictError(
      `"${table.name}" was changed by someone else while you were editing. Reload it and apply your change again.`,
    );
  }
  return table;
}

/** Replaces a unit table's name, kind and rows. Orders that use it see the new rows from now on. */
export async function updateStepTable(
  knex: Knex,
  actor: Actor,
  input: StepTableUpdateData,
): Promise<StepTableView> {
  return transact(knex, async (trx) => {
    const before = await lockEditable(trx, input.id, input.version);
    await assertUnit(trx, input.unitId);
    await trx("step_tables")
      .where({ id: input.id })
      .update({
        unit_id: input.unitId,
        name: input.name,
        kind: input.kind,
        source: input.source || null,
        version: before.version + 1,
      });
    await writeRows(trx, input.id, input.rows);
    const after = (await getStepTable(trx, input.id))!;
    await appendLedger(trx, actor, {
      action: "step_table.update",
      entityType: "step_table",
      entityId: input.id,
      unitId: input.unitId,
      before,
      after,
      rationale: input.rationale,
    });
    return after;
  });
}

/** Retires (or restores) a unit table; orders that already use it keep their reference. */
export async function setStepTableActive(
  knex: Knex,
  actor: Actor,
  input: StepTableActiveData,
): Promise<StepTableView> {
  return transact(knex, async (trx) => {
    const before = await lockEditable(trx, input.id, input.version);
    await trx("step_tables")
      .where({ id: input.id })
      .update({ active: input.active, version: before.version + 1 });
    const after = (await getStepTable(trx, input.id))!;
    await appendLedger(trx, actor, {
      action: input.active ? "step_table.reactivate" : "step_table.deactivate",
      entityType: "step_table",
      entityId: input.id,
      unitId: before.unitId,
      before: { active: before.active },
      after: { active: after.active },
      rationale: input.rationale,
    });
    return after;
  });
}

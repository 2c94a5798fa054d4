import { z } from "zod";
import { defineRead, defineWrite } from "../boundary/operation";
import { listStepTables } from "./queries";
import { stepTableActiveSchema, stepTableCreateSchema, stepTableUpdateSchema } from "./schema";
import { createStepTable, setStepTableActive, updateStepTable } from "./service";

export const createStepTableOperation = defineWrite({
  permission: "step_table.manage",
  schema: stepTableCreateSchema,
  run: (knex, actor, input) => createStepTable(knex, actor, input),
});

export const updateStepTableOperation = defineWrite({
  permission: "step_table.manage",
  schema: stepTableUpdateSchema,
  run: (knex, actor, input) => updateStepTable(knex, actor, input),
});

export const setStepTableActiveOperation = defineWrite({
  permission: "step_table.manage",
  schema: stepTableActiveSchema,
  run: (knex, actor, input) => setStepTableActive(knex, actor, input),
});

/** The step-table library of the caller's units: published tables and the units' own. */
export const listStepTablesOperation = defineRead({
  permission: "record.read",
  schema: z.object({}),
  run: (knex, actor) => listStepTables(knex, actor.unitIds),
});

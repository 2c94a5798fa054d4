import { z } from "zod";
import { defineRead, defineWrite } from "../boundary/operation";
import { listUnitOverviews } from "./queries";
import { bedCreateSchema, bedUpdateSchema, unitCreateSchema, unitUpdateSchema } from "./schema";
import { createBed, createUnit, updateBed, updateUnit } from "./service";

export const createUnitOperation = defineWrite({
  permission: "unit.manage",
  schema: unitCreateSchema,
  run: (knex, actor, input) => createUnit(knex, actor, input),
});

/** Full edit of a unit's settings; the input names the version it was based on (409 if stale). */
export const updateUnitOperation = defineWrite({
  permission: "unit.manage",
  schema: unitUpdateSchema,
  run: (knex, actor, input) => updateUnit(knex, actor, input),
});

export const createBedOperation = defineWrite({
  permission: "unit.manage",
  schema: bedCreateSchema,
  run: (knex, actor, input) => createBed(knex, actor, input),
});

/** Rename, retire or restore a bed. */
export const updateBedOperation = defineWrite({
  permission: "unit.manage",
  schema: bedUpdateSchema,
  run: (knex, actor, input) => updateBed(knex, actor, input),
});

/** The actor's units with their settings and bed counts. */
export const listUnitsOperation = defineRead({
  permission: "record.read",
  schema: z.object({}),
  run: (knex, actor) => listUnitOverviews(knex, actor.unitIds),
});

import { defineRead, defineWrite } from "../boundary/operation";
import { kickRehearsals } from "./runner";
import { rehearsalCreateSchema, rehearsalListSchema, rehearsalReadSchema } from "./schema";
import { readRehearsal, readRehearsals, requestRehearsal } from "./service";

/** Queue a run and have this process start on the queue (the answer does not wait for it). */
export const requestRehearsalOperation = defineWrite({
  permission: "rehearsal.run",
  schema: rehearsalCreateSchema,
  run: async (knex, actor, input, now) => {
    const run = await requestRehearsal(knex, actor, input, now);
    void kickRehearsals(knex);
    return run;
  },
});

/** A unit's runs, newest first. */
export const listRehearsalsOperation = defineRead({
  permission: "record.read",
  schema: rehearsalListSchema,
  run: (knex, actor, query) => readRehearsals(knex, actor, query.unitId),
});

/**
 * One run. A run still waiting (queued, or running with no heartbeat since a
 * restart) puts this process to work on the queue.
 */
export const readRehearsalOperation = defineRead({
  permission: "record.read",
  schema: rehearsalReadSchema,
  run: async (knex, actor, query) => {
    const run = await readRehearsal(knex, actor, query.rehearsalId);
    if (run.status === "queued" || run.status === "running") void kickRehearsals(knex);
    return run;
  },
});

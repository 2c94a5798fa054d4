import { defineRead, defineWrite } from "../boundary/operation";
import { loadHandoff } from "./queries";
import { handoffAcknowledgeSchema, handoffQuerySchema } from "./schema";
import { acknowledgeHandoff } from "./service";

/** A unit's handoff for one handover (the next by default); another unit answers 404. */
export const readHandoffOperation = defineRead({
  permission: "record.read",
  schema: handoffQuerySchema,
  run: (knex, actor, input, now) => loadHandoff(knex, actor, input, now),
});

/** The incoming nurse acknowledges one or more beds' handoff (a repeat changes nothing). */
export const acknowledgeHandoffOperation = defineWrite({
  permission: "handoff.acknowledge",
  schema: handoffAcknowledgeSchema,
  run: (knex, actor, input, now) => acknowledgeHandoff(knex, actor, input, now),
});

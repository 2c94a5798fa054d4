import { defineWrite } from "../boundary/operation";
import { adjustmentSchema } from "./schema";
import { recordAdjustment } from "./service";

/** One applied settings change within the order in effect (nurses: low-flow devices only). */
export const recordAdjustmentOperation = defineWrite({
  permission: "adjustment.record",
  schema: adjustmentSchema,
  run: (knex, actor, input, now) => recordAdjustment(knex, actor, input, now),
});

import { defineWrite } from "../boundary/operation";
import { orderReadSchema } from "./schema";
import { readOrderChange } from "./service";

/** The caller has read the change of an order (their notices of it are marked read). */
export const readOrderChangeOperation = defineWrite({
  permission: "order.acknowledge_change",
  schema: orderReadSchema,
  run: (knex, actor, input, now) => readOrderChange(knex, actor, input, now),
});

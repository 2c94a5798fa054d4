import { z } from "zod";
import { assertUnitAccess } from "../auth/actor-queries";
import { defineRead, defineWrite } from "../boundary/operation";
import { NotFoundError } from "../errors";
import { HISTORY_RANGE, queryTime } from "../validation";
import { getOrder } from "./queries";
import { cosignSchema, discontinueSchema, orderInputSchema } from "./schema";
import { cosignOrder, discontinueOrder, writeOrder } from "./service";

/** A physician's signed order, or a nurse's/therapist's verbal or telephone order. */
export const writeOrderOperation = defineWrite({
  permission: "order.write",
  schema: orderInputSchema,
  run: (knex, actor, input, now) => writeOrder(knex, actor, input, now),
});

/** The named prescriber (or a designated physician) co-signs a verbal or telephone order. */
export const cosignOrderOperation = defineWrite({
  permission: "order.cosign",
  schema: cosignSchema,
  run: (knex, actor, input) => cosignOrder(knex, actor, input),
});

/** A physician discontinues the order in effect, with a reason and their password. */
export const discontinueOrderOperation = defineWrite({
  permission: "order.discontinue",
  schema: discontinueSchema,
  run: (knex, actor, input) => discontinueOrder(knex, actor, input),
});

/** An order as it stands, or as it stood at `asOf` (system-versioned history). */
export const readOrderOperation = defineRead({
  permission: "record.read",
  schema: z.object({
    orderId: z.coerce.number().int().positive("orderId must be a positive whole number."),
    asOf: queryTime("asOf", HISTORY_RANGE).optional(),
  }),
  run: async (knex, actor, { orderId, asOf }) => {
    const order = await getOrder(knex, orderId, asOf);
    if (!order) throw new NotFoundError("No order with that id at that time.");
    assertUnitAccess(actor, order.unitId);
    return { order, asOf: asOf?.toISOString() ?? null };
  },
});

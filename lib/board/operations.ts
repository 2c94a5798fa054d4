import { z } from "zod";
import { assertUnitAccess } from "../auth/actor-queries";
import { defineRead } from "../boundary/operation";
import { loadBoard } from "./queries";

/**
 * The Board of the caller's units (or one of them with `unitId`): units with
 * bed counts, one row per occupied bed, and the server time it was computed at.
 */
export const readBoardOperation = defineRead({
  permission: "record.read",
  schema: z.object({
    unitId: z.coerce
      .number()
      .int("Unit must be a whole number.")
      .positive("Unit must be a positive whole number.")
      .optional(),
  }),
  run: (knex, actor, { unitId }, now) => {
    if (unitId !== undefined) assertUnitAccess(actor, unitId);
    return loadBoard(knex, unitId !== undefined ? [unitId] : actor.unitIds, now);
  },
});

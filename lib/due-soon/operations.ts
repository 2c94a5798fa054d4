import { z } from "zod";
import { defineRead } from "../boundary/operation";
import { dueSoon, DUE_SOON_MINUTES } from "./queries";

/** The caller's beds whose reassessment falls due within the next hour. */
export const readDueSoonOperation = defineRead({
  permission: "record.read",
  schema: z.object({}),
  run: async (knex, actor, _input, now) => ({
    windowMinutes: DUE_SOON_MINUTES,
    beds: await dueSoon(knex, actor, now),
  }),
});

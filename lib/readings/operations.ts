import { defineWrite } from "../boundary/operation";
import { readingSchema } from "./schema";
import { chartReading } from "./service";

/** One charted reading: SpO2 with the device and oxygen in use. */
export const chartReadingOperation = defineWrite({
  permission: "reading.chart",
  schema: readingSchema,
  run: (knex, actor, input, now) => chartReading(knex, actor, input, now),
});

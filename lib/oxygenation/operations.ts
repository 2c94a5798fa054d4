import { defineRead } from "../boundary/operation";
import { evaluateBloodGas, forecastFio2 } from "./evaluate";
import { assessRequestSchema, forecastRequestSchema } from "./schema";

// Computations: a JSON body in, nothing stored (so reads, sent as POST).

/** The oxygenation indices of one blood gas, each with its basis. */
export const assessOperation = defineRead({
  permission: "record.read",
  schema: assessRequestSchema,
  run: (knex, actor, input) => evaluateBloodGas(knex, actor, input),
});

/** PaO2 and SpO2 after a change of FiO2 by three models, with their spread as the range. */
export const forecastOperation = defineRead({
  permission: "record.read",
  schema: forecastRequestSchema,
  run: (knex, actor, input) => forecastFio2(knex, actor, input),
});

import { defineWrite } from "../boundary/operation";
import { bloodGasSchema } from "./schema";
import { recordBloodGas } from "./service";

/** One blood gas (mmHg, g/dL), with its computed indices for an arterial sample. */
export const recordBloodGasOperation = defineWrite({
  permission: "blood_gas.record",
  schema: bloodGasSchema,
  run: (knex, actor, input, now) => recordBloodGas(knex, actor, input, now),
});

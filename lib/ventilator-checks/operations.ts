import { findReadableAdmission } from "../admissions/access";
import { defineRead, defineWrite } from "../boundary/operation";
import { listVentilatorChecks } from "./queries";
import { ventilatorCheckSchema, ventilatorChecksQuerySchema } from "./schema";
import { recordVentilatorCheck } from "./service";

/** One ventilator check, with what Tidemark computes from it and the lung-protection alert. */
export const recordVentilatorCheckOperation = defineWrite({
  permission: "ventilator_check.record",
  schema: ventilatorCheckSchema,
  run: (knex, actor, input, now) => recordVentilatorCheck(knex, actor, input, now),
});

/** A patient's checks of the current (or last) admission, newest first. */
export const readVentilatorChecksOperation = defineRead({
  permission: "record.read",
  schema: ventilatorChecksQuerySchema,
  run: async (knex, actor, { patientId, limit }) => {
    const admission = await findReadableAdmission(knex, actor, patientId);
    return listVentilatorChecks(knex, admission.admissionId, limit);
  },
});

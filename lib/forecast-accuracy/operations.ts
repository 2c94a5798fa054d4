import { z } from "zod";
import { assertUnitAccess } from "../auth/actor-queries";
import { defineRead } from "../boundary/operation";
import { periodQuerySchema } from "../reports/schema";
import { loadForecastAccuracyReport, loadPatientForecastAccuracy } from "./queries";

/** One patient's checked and unchecked forecasts (another unit's patient answers 404). */
export const readPatientForecastAccuracyOperation = defineRead({
  permission: "record.read",
  schema: z.object({
    patientId: z.coerce
      .number({ error: "patientId must be a positive whole number." })
      .int("patientId must be a positive whole number.")
      .positive("patientId must be a positive whole number."),
  }),
  run: (knex, actor, input) => loadPatientForecastAccuracy(knex, actor, input.patientId),
});

/** A unit's forecast accuracy over a period: every role reads its own units'. */
export const readForecastAccuracyReportOperation = defineRead({
  permission: "record.read",
  schema: periodQuerySchema,
  run: (knex, actor, query, now) => {
    assertUnitAccess(actor, query.unitId);
    return loadForecastAccuracyReport(knex, query, now);
  },
});

import { assertUnitAccess } from "../auth/actor-queries";
import { defineRead } from "../boundary/operation";
import { loadReport } from "./queries";
import { reportQuerySchema } from "./schema";
import type { ReportKind } from "./types";

/**
 * One read per report: every role reads the reports of its own units
 * (another unit answers 404, as its records do).
 */
function reportOperation<K extends ReportKind>(kind: K) {
  return defineRead({
    permission: "record.read",
    schema: reportQuerySchema,
    run: (knex, actor, query, now) => {
      assertUnitAccess(actor, query.unitId);
      return loadReport(knex, kind, query, now);
    },
  });
}

export const readTimeInBandReportOperation = reportOperation("time-in-band");
export const readAlertsReportOperation = reportOperation("alerts");
export const readOxygenExposureReportOperation = reportOperation("oxygen-exposure");
export const readOrdersReportOperation = reportOperation("orders");

import { z } from "zod";
import { REPORT_GROUPS } from "./types";

/** Longest period one report may cover (a quarter, rounded up). */
export const MAX_REPORT_DAYS = 93;

const isoTime = (field: string) =>
  z.iso
    .datetime({
      offset: true,
      error: `${field} must be an ISO 8601 time, e.g. 2026-12-01T07:00:00Z.`,
    })
    .transform((v) => new Date(v));

const unitIdField = z.coerce
  .number({ error: "unitId must be a positive whole number." })
  .int("unitId must be a positive whole number.")
  .positive("unitId must be a positive whole number.");

/** A period [from, to) no longer than MAX_REPORT_DAYS. */
function checkPeriod(q: { from: unknown; to: unknown }, ctx: z.RefinementCtx): void {
  // A malformed time is a continuable issue: nothing to compare then.
  if (!(q.from instanceof Date) || !(q.to instanceof Date)) return;
  const span = q.to.getTime() - q.from.getTime();
  if (span <= 0) ctx.addIssue({ code: "custom", path: ["to"], message: "to must be after from." });
  else if (span > MAX_REPORT_DAYS * 86_400_000)
    ctx.addIssue({
      code: "custom",
      path: ["to"],
      message: `The period may span at most ${MAX_REPORT_DAYS} days.`,
    });
}

/** The query of every report: one unit, a period [from, to), the rows. */
export const reportQuerySchema = z
  .object({
    unitId: unitIdField,
    from: isoTime("from"),
    to: isoTime("to"),
    groupBy: z
      .enum(REPORT_GROUPS, { error: `groupBy must be one of ${REPORT_GROUPS.join(", ")}.` })
      .default("patient"),
  })
  .superRefine(checkPeriod);

/** A report without rows to choose (forecast accuracy): one unit, a period [from, to). */
export const periodQuerySchema = z
  .object({ unitId: unitIdField, from: isoTime("from"), to: isoTime("to") })
  .superRefine(checkPeriod);

export type ReportQuery = z.output<typeof reportQuerySchema>;

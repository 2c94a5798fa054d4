import { readRoute } from "@/lib/boundary/next";
import { listStepTablesOperation } from "@/lib/step-tables/operations";

/** The step-table library of the caller's units: published tables and the units' own. */
export const GET = readRoute(listStepTablesOperation, {
  respond: (stepTables) => ({ stepTables }),
});

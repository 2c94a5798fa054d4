import { readRoute, writeRoute } from "@/lib/boundary/next";
import { createUnitOperation, listUnitsOperation } from "@/lib/units/operations";

export const GET = readRoute(listUnitsOperation, { respond: (units) => ({ units }) });

export const POST = writeRoute(createUnitOperation, {
  status: 201,
  respond: (unit) => ({ unit }),
});

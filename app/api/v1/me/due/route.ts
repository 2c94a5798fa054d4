import { readRoute } from "@/lib/boundary/next";
import { readDueSoonOperation } from "@/lib/due-soon/operations";

/** The caller's beds whose reassessment falls due within the next 60 minutes, soonest first. */
export const GET = readRoute(readDueSoonOperation, { respond: (due) => due });

import { readRoute } from "@/lib/boundary/next";
import { readOrdersReportOperation } from "@/lib/reports/operations";

/** The orders report of one unit: `?unitId=&from=&to=&groupBy=patient|bed|shift|day`. */
export const GET = readRoute(readOrdersReportOperation, { respond: (report) => report });

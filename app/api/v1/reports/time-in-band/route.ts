import { readRoute } from "@/lib/boundary/next";
import { readTimeInBandReportOperation } from "@/lib/reports/operations";

/** The time-in-band report of one unit: `?unitId=&from=&to=&groupBy=patient|bed|shift|day`. */
export const GET = readRoute(readTimeInBandReportOperation, { respond: (report) => report });

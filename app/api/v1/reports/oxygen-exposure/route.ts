import { readRoute } from "@/lib/boundary/next";
import { readOxygenExposureReportOperation } from "@/lib/reports/operations";

/** The oxygen-exposure report of one unit: `?unitId=&from=&to=&groupBy=patient|bed|shift|day`. */
export const GET = readRoute(readOxygenExposureReportOperation, { respond: (report) => report });

import { readRoute } from "@/lib/boundary/next";
import { readAlertsReportOperation } from "@/lib/reports/operations";

/** The alerts report of one unit: `?unitId=&from=&to=&groupBy=patient|bed|shift|day`. */
export const GET = readRoute(readAlertsReportOperation, { respond: (report) => report });

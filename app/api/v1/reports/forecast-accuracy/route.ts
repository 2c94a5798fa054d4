import { readRoute } from "@/lib/boundary/next";
import { readForecastAccuracyReportOperation } from "@/lib/forecast-accuracy/operations";

/** The forecast-accuracy report of one unit: `?unitId=&from=&to=`. */
export const GET = readRoute(readForecastAccuracyReportOperation, { respond: (report) => report });

import { readRoute } from "@/lib/boundary/next";
import { readPatientForecastAccuracyOperation } from "@/lib/forecast-accuracy/operations";

/** How the stored forecasts of this patient's admission did against the gases that followed. */
export const GET = readRoute(readPatientForecastAccuracyOperation, {
  ids: ["patientId"],
  respond: (accuracy) => accuracy,
});

import { writeRoute } from "@/lib/boundary/next";
import { forecastOperation } from "@/lib/oxygenation/operations";

/**
 * POST /api/v1/oxygenation/forecast — PaO2 and SpO2 after a change of FiO2, by
 * three models side by side (constant P/F, constant a/A ratio, shunt) with
 * their spread as the range. A PEEP change is not forecast (said in the caveats).
 * Nothing is stored. Any signed-in user (401 without a session).
 *
 * Request (JSON; unknown keys are refused):
 * `{ fio2, pao2, paco2, hemoglobin, nextFio2, barometricPressure?, unitId?,
 *    pressureUnit?: "mmHg" | "kPa", hemoglobinUnit?: "g/dL" | "g/L" | "mmol/L" }`
 * with the units of /assess: FiO2 and nextFio2 as fractions (0.21–1).
 *
 * 200: `{ engineVersion, pressureUnit, input, barometricPressure, forecast, basis }` —
 * `forecast.models.{pf, alveolarArterialRatio, shunt}` and `forecast.range.{low, high}`
 * are `{ pao2 (mmHg), spo2 (%) }`; `forecast.alveolarPO2.{current, next}` in mmHg;
 * `forecast.shuntFraction` 0–1; `forecast.caveats` and `forecast.assumptions`;
 * `basis.{pf, alveolarArterialRatio, shunt, alveolarPO2, spo2, range}` each
 * `{ name, formula, inputs, source, assumptions }`.
 *
 * 400: `{ error: { message, fieldErrors: { <field>: [message] } } }`, ranges stated in the unit typed.
 */
export const POST = writeRoute(forecastOperation, {
  quota: "forecast",
  respond: (result) => result,
});

import { writeRoute } from "@/lib/boundary/next";
import { assessOperation } from "@/lib/oxygenation/operations";

/**
 * POST /api/v1/oxygenation/assess — the oxygenation indices of one blood gas.
 * Nothing is stored. Any signed-in user (401 without a session).
 *
 * Request (JSON; unknown keys are refused):
 * `{ fio2, pao2, paco2, hemoglobin?, spo2?, sao2?, peep?, meanAirwayPressure?,
 *    respiratoryRate?, support?, flow?, barometricPressure?, ageYears?, cardiacOutput?,
 *    unitId?, pressureUnit?: "mmHg" | "kPa", hemoglobinUnit?: "g/dL" | "g/L" | "mmol/L" }`
 * FiO2 is a fraction (0.21–1); SpO2 and SaO2 in %; PaO2, PaCO2 and barometric
 * pressure in `pressureUnit` (default mmHg); haemoglobin in `hemoglobinUnit`
 * (default g/dL); PEEP and mean airway pressure in cmH2O; flow in L/min.
 * Without `barometricPressure`, `unitId` (one of the caller's units) takes it
 * from the unit's altitude; without either, 760 mmHg.
 *
 * 200: `{ engineVersion, pressureUnit, input, barometricPressure, assessment }` —
 * `input` is what the engine computed from (mmHg, g/dL, fractions); every number
 * in `assessment.indices` is `{ value, unit, basis: { name, formula, inputs,
 * source, assumptions } }` with pressures in mmHg (convert with `pressureUnit`
 * for display); `assessment.classification` gives the Berlin 2012 and 2023
 * global categories with the deciding criterion and source; `assessment.caveats`.
 *
 * 400: `{ error: { message, fieldErrors: { <field>: [message] } } }`, ranges stated in the unit typed.
 */
export const POST = writeRoute(assessOperation, {
  respond: (result) => result,
});

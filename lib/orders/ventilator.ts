import type { Knex } from "knex";
import { DEVICE_PROFILES } from "../devices";
import { ValidationError } from "../errors";
import { predictedBodyWeight, RANGES, rangeRefusal, type Sex } from "../oxygen";
import { isVentilatorDevice, VENT_DEFAULTS } from "../ventilation/settings";
import type { OrderData } from "./schema";

/** The words of the refusal when a ventilator order meets a patient without a height. */
export const HEIGHT_MISSING =
  "Height is not recorded for this patient. A ventilator order's tidal volume is per kg of predicted body weight, which needs the height: record it (Record height, on the order form or the Chart), then sign again. Tidemark never estimates it.";

/**
 * The ventilator columns of a new order: the settings as ordered (the pressure
 * limits default to 30 and 15 cmH2O) and the predicted body weight from the
 * patient's recorded height and sex. A ventilator order for a patient without
 * a height is refused, naming heightCm; every other device gets NULLs.
 */
export async function ventilatorColumns(
  knex: Knex,
  input: OrderData,
): Promise<Record<string, number | string | null>> {
  if (!isVentilatorDevice(input.device)) {
    return {
      vent_mode: null,
      vt_target_ml_kg: null,
      vt_min_ml_kg: null,
      vt_max_ml_kg: null,
      rate_min_per_min: null,
      rate_max_per_min: null,
      plateau_limit_cmh2o: null,
      driving_limit_cmh2o: null,
      pbw_kg: null,
      pbw_height_cm: null,
    };
  }
  const patient = (await knex("patients")
    .where({ id: input.patientId })
    .first("height_cm", "sex")) as { height_cm: string | number | null; sex: Sex } | undefined;
  const heightCm = patient?.height_cm == null ? null : Number(patient.height_cm);
  if (heightCm === null)
    throw new ValidationError(
      `${DEVICE_PROFILES[input.device].label} orders need the patient's height.`,
      { heightCm: [HEIGHT_MISSING] },
    );
  if (heightCm < RANGES.heightCm.min || heightCm > RANGES.heightCm.max)
    throw new ValidationError(
      "The recorded height is outside the predicted body weight equation.",
      {
        heightCm: [
          `Recorded height ${heightCm} cm: ${rangeRefusal(RANGES.heightCm.label, RANGES.heightCm)} for the predicted body weight equation. Correct the height, or set the tidal volume outside Tidemark.`,
        ],
      },
    );
  const pbw = predictedBodyWeight({ heightCm, sex: patient!.sex });
  return {
    vent_mode: input.ventMode!,
    vt_target_ml_kg: input.vtTarget!,
    vt_min_ml_kg: input.vtMin!,
    vt_max_ml_kg: input.vtMax!,
    rate_min_per_min: input.rateMin!,
    rate_max_per_min: input.rateMax!,
    plateau_limit_cmh2o: input.plateauLimit ?? VENT_DEFAULTS.plateauLimit,
    driving_limit_cmh2o: input.drivingLimit ?? VENT_DEFAULTS.drivingLimit,
    pbw_kg: Math.round(pbw * 10) / 10,
    pbw_height_cm: heightCm,
  };
}

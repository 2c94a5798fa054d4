import { checkChoice } from "./errors";
import { checkBetween, checkRange, RANGES } from "./ranges";

export type Sex = "female" | "male";
const SEXES = ["female", "male"] as const satisfies readonly Sex[];

/**
 * Predicted body weight in kg (ARDS Network 2000; see SOURCES.predictedBodyWeight):
 * male 50 + 0.91·(height cm − 152.4), female 45.5 + 0.91·(height cm − 152.4).
 */
export function predictedBodyWeight({ heightCm, sex }: { heightCm: number; sex: Sex }): number {
  checkRange("heightCm", heightCm, RANGES.heightCm);
  // A sex read from a form or a file is checked: anything but "male" must not become female.
  return (checkChoice("sex", sex, SEXES) === "male" ? 50 : 45.5) + 0.91 * (heightCm - 152.4);
}

/**
 * Tidal volume per kg of predicted body weight, mL/kg: VT (mL) / PBW (kg), PBW
 * by the ARDS Network equation above (see SOURCES.predictedBodyWeight).
 */
export function tidalVolumePerKg({
  tidalVolumeMl,
  heightCm,
  sex,
}: {
  tidalVolumeMl: number;
  heightCm: number;
  sex: Sex;
}): number {
  checkRange("tidalVolumeMl", tidalVolumeMl, RANGES.tidalVolumeMl);
  return tidalVolumeMl / predictedBodyWeight({ heightCm, sex });
}

function checkPlateauAbovePeep(plateauPressure: number, peep: number): void {
  checkRange("peep", peep, RANGES.peep);
  checkBetween(
    "plateauPressure",
    plateauPressure,
    Math.max(RANGES.plateauPressure.min, peep + 1),
    RANGES.plateauPressure.max,
    RANGES.plateauPressure.unit,
    "the plateau pressure must exceed PEEP",
  );
}

/** Driving pressure in cmH2O: Pplat − PEEP (Amato et al. 2015). */
export function drivingPressure({
  plateauPressure,
  peep,
}: {
  plateauPressure: number;
  peep: number;
}): number {
  checkPlateauAbovePeep(plateauPressure, peep);
  return plateauPressure - peep;
}

/** Static respiratory-system compliance in mL/cmH2O: VT / (Pplat − PEEP). */
export function staticCompliance({
  tidalVolumeMl,
  plateauPressure,
  peep,
}: {
  tidalVolumeMl: number;
  plateauPressure: number;
  peep: number;
}): number {
  checkRange("tidalVolumeMl", tidalVolumeMl, RANGES.tidalVolumeMl);
  return tidalVolumeMl / drivingPressure({ plateauPressure, peep });
}

export interface MechanicalPowerInput {
  respiratoryRate: number;
  tidalVolumeMl: number;
  peakPressure: number;
  plateauPressure: number;
  peep: number;
}

/**
 * Mechanical power in J/min by Gattinoni's simplified equation for
 * volume-controlled ventilation (Gattinoni et al. 2016):
 * MP = 0.098 · RR · VT (L) · (Ppeak − ½ · (Pplat − PEEP)); 0.098 converts L·cmH2O to J.
 */
export function mechanicalPower({
  respiratoryRate,
  tidalVolumeMl,
  peakPressure,
  plateauPressure,
  peep,
}: MechanicalPowerInput): number {
  checkRange("respiratoryRate", respiratoryRate, RANGES.respiratoryRate);
  checkRange("tidalVolumeMl", tidalVolumeMl, RANGES.tidalVolumeMl);
  const driving = drivingPressure({ plateauPressure, peep });
  checkBetween(
    "peakPressure",
    peakPressure,
    plateauPressure,
    RANGES.peakPressure.max,
    RANGES.peakPressure.unit,
    "the peak pressure cannot be below the plateau pressure",
  );
  return 0.098 * respiratoryRate * (tidalVolumeMl / 1000) * (peakPressure - driving / 2);
}

/** Predicted minute ventilation per kg of predicted body weight, mL/min (Sinha 2009). */
export const PREDICTED_MINUTE_VENTILATION_PER_KG = 100;
/** The "ideal" PaCO2 of the ventilatory ratio: 5 kPa, taken as 37.5 mmHg (Sinha 2009, 2019). */
export const IDEAL_PACO2 = 37.5;

/**
 * Ventilatory ratio, unitless (Sinha et al. 2009, 2019; see SOURCES.ventilatoryRatio):
 * VR = (VE (mL/min) × PaCO2 (mmHg)) / (PBW (kg) × 100 × 37.5). About 1 in
 * healthy lungs; it rises with dead space and CO2 production. PaCO2 in mmHg, as
 * every engine function takes it (kPa is converted at the edge, ./units).
 */
export function ventilatoryRatio({
  minuteVentilationLMin,
  paco2,
  predictedBodyWeightKg,
}: {
  minuteVentilationLMin: number;
  paco2: number;
  predictedBodyWeightKg: number;
}): number {
  checkRange("minuteVentilationLMin", minuteVentilationLMin, RANGES.minuteVentilation);
  checkRange("paco2", paco2, RANGES.paco2);
  checkRange("predictedBodyWeightKg", predictedBodyWeightKg, RANGES.predictedBodyWeight);
  return (
    (minuteVentilationLMin * 1000 * paco2) /
    (predictedBodyWeightKg * PREDICTED_MINUTE_VENTILATION_PER_KG * IDEAL_PACO2)
  );
}

/** Yang & Tobin 1991: f/VT below 105 breaths/min/L predicted a successful weaning trial. */
export const RSBI_THRESHOLD = 105;

/**
 * Rapid shallow breathing index, breaths/min/L (Yang & Tobin 1991; see
 * SOURCES.rapidShallowBreathingIndex): f / VT (L). Measured in the study over
 * one minute of unassisted breathing; on pressure support or CPAP it reads
 * lower (common practice).
 */
export function rapidShallowBreathingIndex({
  respiratoryRate,
  tidalVolumeMl,
}: {
  respiratoryRate: number;
  tidalVolumeMl: number;
}): number {
  checkRange("respiratoryRate", respiratoryRate, RANGES.respiratoryRate);
  checkRange("tidalVolumeMl", tidalVolumeMl, RANGES.tidalVolumeMl);
  return respiratoryRate / (tidalVolumeMl / 1000);
}

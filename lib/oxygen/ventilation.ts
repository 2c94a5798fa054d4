import { checkBetween, checkRange, RANGES } from "./ranges";

export type Sex = "female" | "male";

/**
 * Predicted body weight in kg (ARDS Network 2000):
 * male 50 + 0.91·(height cm − 152.4), female 45.5 + 0.91·(height cm − 152.4).
 */
export function predictedBodyWeight({ heightCm, sex }: { heightCm: number; sex: Sex }): number {
  checkRange("heightCm", heightCm, RANGES.heightCm);
  return (sex === "male" ? 50 : 45.5) + 0.91 * (heightCm - 152.4);
}

/** Tidal volume per kg of predicted body weight, mL/kg. */
export function tidalVolumePerKilogram({
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

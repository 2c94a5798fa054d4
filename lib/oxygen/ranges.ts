import { OxygenInputError } from "./errors";
import { SPO2_READING_RANGE } from "./oximetry";

/** An accepted input range, inclusive at both ends. */
export interface InputRange {
  readonly min: number;
  readonly max: number;
  readonly unit: string;
}

/**
 * Every physiological range the engine accepts, in one place. Inputs outside
 * these are refused with an OxygenInputError naming the field and the range.
 * The bounds are deliberately wide (adult critical care, sea level to high
 * altitude, no hyperbaric oxygen): they exist to catch typing and unit errors
 * (kPa typed as mmHg, FiO2 typed as a percentage), not to judge the patient.
 */
export const RANGES = {
  // Hypoxic gas mixtures are not prescribed on the wards Tidemark serves.
  fio2: { min: 0.21, max: 1, unit: "fraction" },
  // Arterial PO2: below 10 mmHg is not a live arterial sample; above 700 mmHg
  // needs hyperbaric oxygen (PAO2 at FiO2 1 and 800 mmHg is about 745 mmHg).
  pao2: { min: 10, max: 700, unit: "mmHg" },
  // Any blood or gas PO2 the dissociation curve is asked about.
  po2: { min: 1, max: 800, unit: "mmHg" },
  // Saturation for the inverse curve: 0 and 1 map to PO2 0 and infinity.
  saturation: { min: 0.001, max: 0.9999, unit: "fraction" },
  // Saturation as a content input (SaO2), where 0 and 1 are meaningful.
  saturationFraction: { min: 0, max: 1, unit: "fraction" },
  // SpO2 as an index input (S/F, OSI, ROX, the ARDS definitions): below 40 %
  // no oximeter is calibrated and the indices mean nothing.
  spo2: { min: 40, max: 100, unit: "%" },
  // SpO2 as a charted reading: anything an oximeter displays (./oximetry).
  spo2Reading: SPO2_READING_RANGE,
  paco2: { min: 10, max: 150, unit: "mmHg" },
  hemoglobin: { min: 3, max: 25, unit: "g/dL" },
  // 150 mmHg is the ICAO pressure near the tropopause; 800 mmHg a deep
  // below-sea-level site in high pressure weather. Hyperbaric is excluded.
  barometricPressure: { min: 150, max: 800, unit: "mmHg" },
  // 47 mmHg at 37 °C; about 55 mmHg at 40 °C.
  waterVapourPressure: { min: 0, max: 60, unit: "mmHg" },
  respiratoryQuotient: { min: 0.6, max: 1.3, unit: "ratio" },
  respiratoryRate: { min: 2, max: 80, unit: "/min" },
  meanAirwayPressure: { min: 1, max: 60, unit: "cmH2O" },
  peep: { min: 0, max: 30, unit: "cmH2O" },
  // Also at least PEEP + 1 cmH2O: a smaller driving pressure with a real tidal
  // volume would mean a compliance no lung has.
  plateauPressure: { min: 1, max: 60, unit: "cmH2O" },
  // Also at least the plateau pressure.
  peakPressure: { min: 1, max: 80, unit: "cmH2O" },
  tidalVolumeMl: { min: 50, max: 2000, unit: "mL" },
  // The ARDS Network PBW equation is for adults; at 102 cm it reaches 0 kg.
  heightCm: { min: 130, max: 230, unit: "cm" },
  // The ICAO formula holds in the troposphere (up to 11,000 m).
  altitude: { min: -500, max: 11000, unit: "m" },
  flow: { min: 0, max: 80, unit: "L/min" },
  cardiacOutput: { min: 0.5, max: 20, unit: "L/min" },
  oxygenContent: { min: 0, max: 40, unit: "mL/dL" },
  // The age/4 + 4 rule of thumb is an adult rule.
  ageYears: { min: 18, max: 120, unit: "years" },
  gasFraction: { min: 0, max: 1, unit: "fraction" },
  // Unit conversions accept anything physical, not only physiological values.
  pressureMmHg: { min: 0, max: 1000, unit: "mmHg" },
  hemoglobinGramsPerDecilitre: { min: 0, max: 30, unit: "g/dL" },
} as const satisfies Record<string, InputRange>;

/**
 * The lowest alveolar PO2 the alveolar gas equation may return. Below it the
 * inputs contradict each other (e.g. PaCO2 150 mmHg on room air at altitude):
 * the equation would give a negative PAO2.
 */
export const MIN_ALVEOLAR_PO2 = 1;

/** Returns `value` if it is finite and inside `[min, max]`, else throws. */
export function checkBetween(
  field: string,
  value: number,
  min: number,
  max: number,
  unit: string,
  reason?: string,
): number {
  if (!Number.isFinite(value) || value < min || value > max) {
    throw new OxygenInputError({ field, value, min, max, unit, reason });
  }
  return value;
}

/** Returns `value` if it is finite and inside `range`, else throws. */
export function checkRange(field: string, value: number, range: InputRange): number {
  return checkBetween(field, value, range.min, range.max, range.unit);
}

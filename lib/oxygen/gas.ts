import { checkBetween, checkRange, MIN_ALVEOLAR_PO2, RANGES } from "./ranges";
import { convertPressure } from "./units";

export const STANDARD_BAROMETRIC_PRESSURE = 760;
/** Saturated water vapour pressure at 37 °C, mmHg. */
export const BODY_WATER_VAPOUR_PRESSURE = 47;
export const DEFAULT_RESPIRATORY_QUOTIENT = 0.8;

/** Dalton's law: the partial pressure of a gas is its fraction of the total pressure. */
export function partialPressure({
  fraction,
  totalPressure,
}: {
  fraction: number;
  totalPressure: number;
}): number {
  checkRange("fraction", fraction, RANGES.gasFraction);
  checkRange("totalPressure", totalPressure, RANGES.barometricPressure);
  return fraction * totalPressure;
}

export interface InspiredGasInput {
  fio2: number;
  barometricPressure?: number;
  waterVapourPressure?: number;
}

/** Inspired PO2 once the gas is warmed and saturated with water in the airways: FiO2·(PB − PH2O). */
export function inspiredPO2({
  fio2,
  barometricPressure = STANDARD_BAROMETRIC_PRESSURE,
  waterVapourPressure = BODY_WATER_VAPOUR_PRESSURE,
}: InspiredGasInput): number {
  checkRange("fio2", fio2, RANGES.fio2);
  checkRange("barometricPressure", barometricPressure, RANGES.barometricPressure);
  checkRange("waterVapourPressure", waterVapourPressure, RANGES.waterVapourPressure);
  return fio2 * (barometricPressure - waterVapourPressure);
}

export interface AlveolarGasInput extends InspiredGasInput {
  paco2: number;
  respiratoryQuotient?: number;
}

/**
 * Alveolar PO2 by the simplified alveolar gas equation,
 * PAO2 = FiO2·(PB − PH2O) − PaCO2/R (Fenn, Rahn & Otis 1946; see SOURCES.alveolarGas).
 * Refuses a PaCO2 so high for the inspired PO2 that PAO2 would fall below
 * MIN_ALVEOLAR_PO2: such inputs contradict each other.
 */
export function alveolarPO2({
  fio2,
  paco2,
  barometricPressure = STANDARD_BAROMETRIC_PRESSURE,
  waterVapourPressure = BODY_WATER_VAPOUR_PRESSURE,
  respiratoryQuotient = DEFAULT_RESPIRATORY_QUOTIENT,
}: AlveolarGasInput): number {
  const inspired = inspiredPO2({ fio2, barometricPressure, waterVapourPressure });
  checkRange("respiratoryQuotient", respiratoryQuotient, RANGES.respiratoryQuotient);
  checkRange("paco2", paco2, RANGES.paco2);
  checkBetween(
    "paco2",
    paco2,
    RANGES.paco2.min,
    (inspired - MIN_ALVEOLAR_PO2) * respiratoryQuotient,
    RANGES.paco2.unit,
    `at FiO2 ${fio2} and barometric pressure ${barometricPressure} mmHg a higher PaCO2 leaves no alveolar oxygen`,
  );
  return inspired - paco2 / respiratoryQuotient;
}

/**
 * Barometric pressure at an altitude by the ICAO standard atmosphere,
 * P = 101325·(1 − 2.25577e-5·h)^5.25588 Pa (ICAO Doc 7488), returned in mmHg.
 * Weather moves the real pressure by a few percent either way.
 */
export function barometricPressureAtAltitude(metres: number): number {
  checkRange("metres", metres, RANGES.altitude);
  const pascals = 101325 * (1 - 2.25577e-5 * metres) ** 5.25588;
  return convertPressure(pascals / 1000, "kPa", "mmHg");
}

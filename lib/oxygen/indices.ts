import { checkRange, RANGES } from "./ranges";

/** P/F ratio in mmHg: PaO2 / FiO2 (Horovitz 1974; see SOURCES.pfRatio). */
export function pfRatio(pao2: number, fio2: number): number {
  checkRange("pao2", pao2, RANGES.pao2);
  checkRange("fio2", fio2, RANGES.fio2);
  return pao2 / fio2;
}

/** S/F ratio: SpO2 (%) / FiO2 (Rice et al. 2007). Uninformative above SpO2 97 %. */
export function sfRatio(spo2: number, fio2: number): number {
  checkRange("spo2", spo2, RANGES.spo2Index);
  checkRange("fio2", fio2, RANGES.fio2);
  return spo2 / fio2;
}

/** ROX index: (SpO2 % / FiO2) / respiratory rate (Roca et al. 2016, 2019), validated on HFNC. */
export function roxIndex({
  spo2,
  fio2,
  respiratoryRate,
}: {
  spo2: number;
  fio2: number;
  respiratoryRate: number;
}): number {
  checkRange("respiratoryRate", respiratoryRate, RANGES.respiratoryRate);
  return sfRatio(spo2, fio2) / respiratoryRate;
}

/** Oxygenation index: FiO2 (%) × mean airway pressure (cmH2O) / PaO2 (mmHg), as published (PALICC 2015). */
export function oxygenationIndex({
  fio2,
  meanAirwayPressure,
  pao2,
}: {
  fio2: number;
  meanAirwayPressure: number;
  pao2: number;
}): number {
  checkRange("fio2", fio2, RANGES.fio2);
  checkRange("meanAirwayPressure", meanAirwayPressure, RANGES.meanAirwayPressure);
  checkRange("pao2", pao2, RANGES.pao2);
  return (fio2 * 100 * meanAirwayPressure) / pao2;
}

/** Oxygen saturation index: FiO2 (%) × mean airway pressure (cmH2O) / SpO2 (%) (Thomas 2010; PALICC 2015). */
export function oxygenSaturationIndex({
  fio2,
  meanAirwayPressure,
  spo2,
}: {
  fio2: number;
  meanAirwayPressure: number;
  spo2: number;
}): number {
  checkRange("fio2", fio2, RANGES.fio2);
  checkRange("meanAirwayPressure", meanAirwayPressure, RANGES.meanAirwayPressure);
  checkRange("spo2", spo2, RANGES.spo2Index);
  return (fio2 * 100 * meanAirwayPressure) / spo2;
}

/** Expected A–a gradient breathing room air, mmHg: age/4 + 4 (bedside rule, common practice). */
export function expectedAaGradient(ageYears: number): number {
  checkRange("ageYears", ageYears, RANGES.ageYears);
  return ageYears / 4 + 4;
}

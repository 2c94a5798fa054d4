import { barometricPressureAtAltitude } from "./gas";
import { pfRatio, sfRatio } from "./indices";
import { checkRange, RANGES } from "./ranges";
import { SOURCES } from "./sources";

/**
 * The respiratory support in use when the sample was taken.
 * - `none`: room air, no device.
 * - `conventional`: low-flow or fixed-performance oxygen (nasal cannula, simple
 *   or Venturi mask, reservoir mask): no end-expiratory pressure, no high flow.
 * - `hfnc`: heated humidified high-flow nasal cannula; give `flow` in L/min.
 * - `niv`: non-invasive ventilation or CPAP by mask or helmet; give the
 *   end-expiratory pressure (CPAP or EPAP) as `peep`.
 * - `invasive`: mechanical ventilation through a tracheal tube or tracheostomy.
 */
export type RespiratorySupport = "none" | "conventional" | "hfnc" | "niv" | "invasive";

export type BerlinCategory = "none" | "mild" | "moderate" | "severe" | "not-classifiable";
/** `ards` is the non-intubated category of the global definition, which has no severity bands. */
export type GlobalCategory = "none" | "ards" | "mild" | "moderate" | "severe" | "not-classifiable";

export interface ClassificationResult<Category extends string> {
  category: Category;
  /** The criterion that decided the category, in words. */
  criterion: string;
  /** The numbers the criterion was applied to. */
  values: Record<string, number>;
  source: string;
}

export interface OxygenationClassification {
  berlin: ClassificationResult<BerlinCategory>;
  global: ClassificationResult<GlobalCategory>;
  /** Only the oxygenation criterion is assessed; timing, imaging and origin of oedema are the clinician's. */
  note: string;
}

export interface ClassifyOxygenationInput {
  /** mmHg */
  pao2?: number;
  /** % */
  spo2?: number;
  fio2: number;
  /** PEEP, CPAP or EPAP in cmH2O */
  peep?: number;
  support?: RespiratorySupport;
  /** HFNC flow in L/min */
  flow?: number;
  /** mmHg; Berlin corrects P/F for altitude above 1000 m */
  barometricPressure?: number;
}

const MINIMUM_PEEP = 5;
const MINIMUM_HFNC_FLOW = 30;
const HIGHEST_SPO2_FOR_SF = 97;
// Berlin footnote: above 1000 m use P/F × PB/760.
const BERLIN_ALTITUDE_PRESSURE = barometricPressureAtAltitude(1000);

const ratio = (value: number): string => String(Math.round(value));

function berlin(input: ClassifyOxygenationInput, pf: number | undefined): ClassificationResult<BerlinCategory> {
  const result = (category: BerlinCategory, criterion: string, values: Record<string, number> = {}) => ({
    category,
    criterion,
    values,
    source: SOURCES.berlin,
  });
  const { peep, support, barometricPressure } = input;
  if (pf === undefined) return result("not-classifiable", "Berlin 2012 grades by PaO2/FiO2; no PaO2 was given");
  if (support === "none" || support === "conventional" || support === "hfnc") {
    return result(
      "not-classifiable",
      `Berlin 2012 requires PEEP or CPAP ≥ ${MINIMUM_PEEP} cmH2O; the support in use (${support}) provides none`,
      { pfRatio: pf },
    );
  }
  if (peep === undefined) return result("not-classifiable", "Berlin 2012 requires PEEP or CPAP ≥ 5 cmH2O; PEEP was not given", { pfRatio: pf });
  if (peep < MINIMUM_PEEP) {
    return result("not-classifiable", `PEEP ${peep} cmH2O is below the ${MINIMUM_PEEP} cmH2O Berlin 2012 requires`, {
      pfRatio: pf,
      peep,
    });
  }
  const corrected = barometricPressure !== undefined && barometricPressure < BERLIN_ALTITUDE_PRESSURE;
  const value = corrected ? (pf * barometricPressure) / 760 : pf;
  const values: Record<string, number> = corrected
    ? { pfRatio: pf, adjustedPfRatio: value, barometricPressure, peep }
    : { pfRatio: pf, peep };
  const shown = corrected ? `P/F ${ratio(value)} mmHg (altitude-adjusted × PB/760)` : `P/F ${ratio(value)} mmHg`;
  const assumed = support === undefined ? "; support not stated, PEEP taken as invasive" : "";
  if (value > 300) return result("none", `${shown} > 300 with PEEP ${peep} cmH2O: outside the Berlin oxygenation bands${assumed}`, values);
  if (value > 200) return result("mild", `200 < ${shown} ≤ 300 with PEEP/CPAP ${peep} cmH2O${assumed}`, values);
  if (support === "niv") {
    return result(
      "not-classifiable",
      `${shown} ≤ 200 on non-invasive support: Berlin 2012 accepts non-invasive CPAP only for the mild band`,
      values,
    );
  }
  if (value > 100) return result("moderate", `100 < ${shown} ≤ 200 with PEEP ${peep} cmH2O${assumed}`, values);
  return result("severe", `${shown} ≤ 100 with PEEP ${peep} cmH2O${assumed}`, values);
}

function globalDefinition(
  input: ClassifyOxygenationInput,
  pf: number | undefined,
  sf: number | undefined,
): ClassificationResult<GlobalCategory> {
  const result = (category: GlobalCategory, criterion: string, values: Record<string, number> = {}) => ({
    category,
    criterion,
    values,
    source: SOURCES.globalDefinition,
  });
  const { support, peep, flow, spo2 } = input;
  if (support === undefined) return result("not-classifiable", "The 2023 global definition depends on the support in use; none was stated");
  if (support === "none" || support === "conventional") {
    return result(
      "not-classifiable",
      "The 2023 global definition requires HFNC ≥ 30 L/min, NIV/CPAP ≥ 5 cmH2O or invasive ventilation (its resource-limited variant is not applied)",
    );
  }
  if (support === "hfnc" && (flow === undefined || flow < MINIMUM_HFNC_FLOW)) {
    return result(
      "not-classifiable",
      flow === undefined
        ? "HFNC flow was not given; the global definition requires ≥ 30 L/min"
        : `HFNC flow ${flow} L/min is below the 30 L/min the global definition requires`,
      flow === undefined ? {} : { flow },
    );
  }
  if (support === "niv" && (peep === undefined || peep < MINIMUM_PEEP)) {
    return result(
      "not-classifiable",
      peep === undefined
        ? "End-expiratory pressure was not given; the global definition requires NIV/CPAP ≥ 5 cmH2O"
        : `End-expiratory pressure ${peep} cmH2O is below the 5 cmH2O the global definition requires`,
      peep === undefined ? {} : { peep },
    );
  }
  // P/F decides when there is a PaO2 (the arterial measurement); S/F only without one.
  let measure: { name: "P/F" | "S/F"; value: number; bands: readonly [number, number, number] };
  if (pf !== undefined) measure = { name: "P/F", value: pf, bands: [300, 200, 100] };
  else if (sf !== undefined && spo2 !== undefined && spo2 <= HIGHEST_SPO2_FOR_SF) measure = { name: "S/F", value: sf, bands: [315, 235, 148] };
  else if (sf !== undefined) {
    return result("not-classifiable", `SpO2 ${spo2} % is above 97 %: the global definition does not use S/F there, and no PaO2 was given`, {
      sfRatio: sf,
    });
  } else return result("not-classifiable", "Neither PaO2 nor SpO2 was given");

  const key = measure.name === "P/F" ? "pfRatio" : "sfRatio";
  const values: Record<string, number> = { [key]: measure.value };
  if (support === "hfnc" && flow !== undefined) values.flow = flow;
  if (peep !== undefined) values.peep = peep;
  const [mild, moderate, severe] = measure.bands;
  const shown = `${measure.name} ${ratio(measure.value)}`;
  if (measure.value > mild) return result("none", `${shown} > ${mild}: outside the global definition's oxygenation criterion`, values);
  if (support !== "invasive") {
    const device = support === "hfnc" ? `HFNC ${flow} L/min` : `NIV/CPAP ${peep} cmH2O`;
    return result("ards", `${shown} ≤ ${mild} on ${device} (non-intubated: no severity bands)`, values);
  }
  if (measure.value > moderate) return result("mild", `${moderate} < ${shown} ≤ ${mild}, intubated`, values);
  if (measure.value > severe) return result("moderate", `${severe} < ${shown} ≤ ${moderate}, intubated`, values);
  return result("severe", `${shown} ≤ ${severe}, intubated`, values);
}

/**
 * The oxygenation criterion of the Berlin definition (ARDS Definition Task
 * Force, JAMA 2012) and of the 2023 global definition (Matthay et al., AJRCCM
 * 2024), each with the criterion that decided it. Berlin: P/F bands 300/200/100
 * with PEEP/CPAP ≥ 5 cmH2O (non-invasive only for mild), P/F × PB/760 above
 * 1000 m. Global: HFNC ≥ 30 L/min, NIV/CPAP ≥ 5 cmH2O or intubation; P/F ≤ 300
 * or S/F ≤ 315 with SpO2 ≤ 97 %; intubated bands P/F 300/200/100, S/F 315/235/148.
 */
export function classifyOxygenation(input: ClassifyOxygenationInput): OxygenationClassification {
  const { pao2, spo2, fio2, peep, flow, barometricPressure } = input;
  checkRange("fio2", fio2, RANGES.fio2);
  if (peep !== undefined) checkRange("peep", peep, RANGES.peep);
  if (flow !== undefined) checkRange("flow", flow, RANGES.flow);
  if (barometricPressure !== undefined) checkRange("barometricPressure", barometricPressure, RANGES.barometricPressure);
  const pf = pao2 === undefined ? undefined : pfRatio(pao2, fio2);
  const sf = spo2 === undefined ? undefined : sfRatio(spo2, fio2);
  return {
    berlin: berlin(input, pf),
    global: globalDefinition(input, pf, sf),
    note: "Oxygenation criterion only: timing, bilateral opacities and the origin of oedema are for the clinician to judge.",
  };
}

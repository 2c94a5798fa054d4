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

/** Which ratio set the category: one of them, or both when they fall in the same band. */
export type ClassifiedBy = "P/F" | "S/F" | "both";

export interface ClassificationResult<Category extends string> {
  category: Category;
  /** The criterion that decided the category, in words. */
  criterion: string;
  /** The numbers the criterion was applied to. */
  values: Record<string, number>;
  source: string;
  /**
   * Global definition only, when it classified: the ratio whose band is
   * reported. Absent on Berlin (P/F only) and when not classifiable.
   */
  classifiedBy?: ClassifiedBy;
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

function berlin(
  input: ClassifyOxygenationInput,
  pf: number | undefined,
): ClassificationResult<BerlinCategory> {
  const result = (
    category: BerlinCategory,
    criterion: string,
    values: Record<string, number> = {},
  ) => ({
    category,
    criterion,
    values,
    source: SOURCES.berlin,
  });
  const { peep, support, barometricPressure } = input;
  if (pf === undefined)
    return result("not-classifiable", "Berlin 2012 grades by PaO2/FiO2; no PaO2 was given");
  if (support === "none" || support === "conventional" || support === "hfnc") {
    return result(
      "not-classifiable",
      `Berlin 2012 requires PEEP or CPAP ≥ ${MINIMUM_PEEP} cmH2O; the support in use (${support}) provides none`,
      { pfRatio: pf },
    );
  }
  if (peep === undefined)
    return result(
      "not-classifiable",
      "Berlin 2012 requires PEEP or CPAP ≥ 5 cmH2O; PEEP was not given",
      { pfRatio: pf },
    );
  if (peep < MINIMUM_PEEP) {
    return result(
      "not-classifiable",
      `PEEP ${peep} cmH2O is below the ${MINIMUM_PEEP} cmH2O Berlin 2012 requires`,
      {
        pfRatio: pf,
        peep,
      },
    );
  }
  const corrected =
    barometricPressure !== undefined && barometricPressure < BERLIN_ALTITUDE_PRESSURE;
  const value = corrected ? (pf * barometricPressure) / 760 : pf;
  const values: Record<string, number> = corrected
    ? { pfRatio: pf, adjustedPfRatio: value, barometricPressure, peep }
    : { pfRatio: pf, peep };
  const shown = corrected
    ? `P/F ${ratio(value)} mmHg (altitude-adjusted × PB/760)`
    : `P/F ${ratio(value)} mmHg`;
  const assumed = support === undefined ? "; support not stated, PEEP taken as invasive" : "";
  if (value > 300)
    return result(
      "none",
      `${shown} > 300 with PEEP ${peep} cmH2O: outside the Berlin oxygenation bands${assumed}`,
      values,
    );
  if (value > 200)
    return result("mild", `200 < ${shown} ≤ 300 with PEEP/CPAP ${peep} cmH2O${assumed}`, values);
  if (support === "niv") {
    return result(
      "not-classifiable",
      `${shown} ≤ 200 on non-invasive support: Berlin 2012 accepts non-invasive CPAP only for the mild band`,
      values,
    );
  }
  if (value > 100)
    return result("moderate", `100 < ${shown} ≤ 200 with PEEP ${peep} cmH2O${assumed}`, values);
  return result("severe", `${shown} ≤ 100 with PEEP ${peep} cmH2O${assumed}`, values);
}

/** A ratio's band: graded when intubated, "ards" (within, ungraded) when not. */
type GlobalBand = "none" | "ards" | "mild" | "moderate" | "severe";
const BAND_ORDER: readonly GlobalBand[] = ["none", "ards", "mild", "moderate", "severe"];
/** Global definition bands, upper bounds of mild, moderate and severe. */
const PF_BANDS = [300, 200, 100] as const;
const SF_BANDS = [315, 235, 148] as const;

type RatioAssessment = { name: "P/F" | "S/F"; value: number; band: GlobalBand; text: string };

function assessRatio(
  name: "P/F" | "S/F",
  value: number,
  [mild, moderate, severe]: readonly [number, number, number],
  graded: boolean,
): RatioAssessment {
  const shown = `${name} ${ratio(value)}`;
  if (value > mild) return { name, value, band: "none", text: `${shown} > ${mild}` };
  if (!graded) return { name, value, band: "ards", text: `${shown} ≤ ${mild}` };
  if (value > moderate)
    return { name, value, band: "mild", text: `${moderate} < ${shown} ≤ ${mild}` };
  if (value > severe)
    return { name, value, band: "moderate", text: `${severe} < ${shown} ≤ ${moderate}` };
  return { name, value, band: "severe", text: `${shown} ≤ ${severe}` };
}

function globalDefinition(
  input: ClassifyOxygenationInput,
  pf: number | undefined,
  sf: number | undefined,
): ClassificationResult<GlobalCategory> {
  const result = (
    category: GlobalCategory,
    criterion: string,
    values: Record<string, number> = {},
    classifiedBy?: ClassifiedBy,
  ): ClassificationResult<GlobalCategory> => ({
    category,
    criterion,
    values,
    source: SOURCES.globalDefinition,
    ...(classifiedBy ? { classifiedBy } : {}),
  });
  const { support, peep, flow, spo2 } = input;
  if (support === undefined)
    return result(
      "not-classifiable",
      "The 2023 global definition depends on the support in use; none was stated",
    );
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
  // The definition's oxygenation criterion is P/F ≤ 300 or S/F ≤ 315, S/F only
  // with SpO2 ≤ 97 %. Both ratios are assessed when both are available.
  const sfUsable = sf !== undefined && spo2 !== undefined && spo2 <= HIGHEST_SPO2_FOR_SF;
  const sfSkipped =
    sf !== undefined && !sfUsable
      ? `S/F not used: SpO2 ${spo2} % > ${HIGHEST_SPO2_FOR_SF} %`
      : undefined;
  // Severity bands apply to intubated patients only.
  const graded = support === "invasive";
  const assessed: RatioAssessment[] = [];
  if (pf !== undefined) assessed.push(assessRatio("P/F", pf, PF_BANDS, graded));
  if (sfUsable) assessed.push(assessRatio("S/F", sf, SF_BANDS, graded));

  const values: Record<string, number> = {};
  if (pf !== undefined) values.pfRatio = pf;
  if (sf !== undefined) values.sfRatio = sf;
  if (sf !== undefined && spo2 !== undefined) values.spo2 = spo2;
  if (support === "hfnc" && flow !== undefined) values.flow = flow;
  if (peep !== undefined) values.peep = peep;

  if (assessed.length === 0) {
    return sfSkipped
      ? result(
          "not-classifiable",
          `SpO2 ${spo2} % is above 97 %: the global definition does not use S/F there, and no PaO2 was given`,
          values,
        )
      : result("not-classifiable", "Neither PaO2 nor SpO2 was given");
  }

  // When P/F and S/F fall in different bands the worse band is reported. This
  // is our reading of the definition, which lists the two ratios as
  // alternatives without saying which decides when they disagree: either one
  // meeting the criterion meets it, and grading by the worse one does not
  // under-grade a patient that one of the two puts in a more severe band.
  const worst = assessed.reduce((a, b) =>
    BAND_ORDER.indexOf(b.band) > BAND_ORDER.indexOf(a.band) ? b : a,
  );
  const agree = assessed.length === 2 && assessed[0]!.band === assessed[1]!.band;
  const classifiedBy: ClassifiedBy = agree ? "both" : worst.name;
  const other = assessed.find((a) => a !== worst);
  const sfCondition = ` (SpO2 ${spo2} % ≤ ${HIGHEST_SPO2_FOR_SF} %)`;
  const deciding = agree
    ? `${assessed[0]!.text} and ${assessed[1]!.text}${sfCondition}`
    : `${worst.text}${worst.name === "S/F" ? sfCondition : ""}`;
  const bandWords = (band: GlobalBand) =>
    band === "none" ? "outside the criterion" : band === "ards" ? "within the criterion" : band;
  const tail = [
    ...(other && !agree
      ? [`${other.name} ${ratio(other.value)} would be ${bandWords(other.band)}`]
      : []),
    ...(sfSkipped ? [sfSkipped] : []),
  ]
    .map((t) => `; ${t}`)
    .join("");

  if (worst.band === "none") {
    return result(
      "none",
      `${deciding}: outside the global definition's oxygenation criterion${tail}`,
      values,
      classifiedBy,
    );
  }
  if (worst.band === "ards") {
    const device = support === "hfnc" ? `HFNC ${flow} L/min` : `NIV/CPAP ${peep} cmH2O`;
    return result(
      "ards",
      `${deciding} on ${device} (non-intubated: no severity bands)${tail}`,
      values,
      classifiedBy,
    );
  }
  return result(worst.band, `${deciding}: ${worst.band}, intubated${tail}`, values, classifiedBy);
}

/**
 * The oxygenation criterion of the Berlin definition (ARDS Definition Task
 * Force, JAMA 2012) and of the 2023 global definition (Matthay et al., AJRCCM
 * 2024), each with the criterion that decided it. Berlin: P/F bands 300/200/100
 * with PEEP/CPAP ≥ 5 cmH2O (non-invasive only for mild), P/F × PB/760 above
 * 1000 m. Global: HFNC ≥ 30 L/min, NIV/CPAP ≥ 5 cmH2O or intubation; P/F ≤ 300
 * or S/F ≤ 315 with SpO2 ≤ 97 %; intubated bands P/F 300/200/100, S/F 315/235/148.
 * With both ratios, either meeting the criterion meets it and the worse band is
 * reported (our reading; see globalDefinition), with `classifiedBy` naming it.
 */
export function classifyOxygenation(input: ClassifyOxygenationInput): OxygenationClassification {
  const { pao2, spo2, fio2, peep, flow, barometricPressure } = input;
  checkRange("fio2", fio2, RANGES.fio2);
  if (peep !== undefined) checkRange("peep", peep, RANGES.peep);
  if (flow !== undefined) checkRange("flow", flow, RANGES.flow);
  if (barometricPressure !== undefined)
    checkRange("barometricPressure", barometricPressure, RANGES.barometricPressure);
  const pf = pao2 === undefined ? undefined : pfRatio(pao2, fio2);
  const sf = spo2 === undefined ? undefined : sfRatio(spo2, fio2);
  return {
    berlin: berlin(input, pf),
    global: globalDefinition(input, pf, sf),
    note: "Oxygenation criterion only: timing, bilateral opacities and the origin of oedema are for the clinician to judge.",
  };
}

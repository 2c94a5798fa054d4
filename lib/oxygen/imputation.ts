import type { Basis } from "./basis";
import { po2FromSaturation } from "./dissociation";
import { checkChoice } from "./errors";
import { BELOW_OXIMETER_ACCURACY_LABEL, belowOximeterAccuracy } from "./oximetry";
import { checkRange, RANGES } from "./ranges";
import { SOURCES } from "./sources";

export type PfImputationMethod = "linear" | "nonlinear";
const METHODS = ["linear", "nonlinear"] as const satisfies readonly PfImputationMethod[];

/** Rice et al. 2007: S/F = 64 + 0.84 × P/F. */
export const RICE_INTERCEPT = 64;
export const RICE_SLOPE = 0.84;
/** Rice et al. derived the linear equation from SpO2 ≤ 97 % only. */
export const HIGHEST_SPO2_FOR_LINEAR_IMPUTING = 97;
/**
 * Above this SpO2 the dissociation curve is too flat to impute PaO2 from it;
 * Brown et al. 2016 imputed from SpO2 ≤ 96 % only.
 */
export const HIGHEST_SPO2_FOR_IMPUTING = 96;

interface PfImputationCommon {
  method: PfImputationMethod;
  /** SpO2 (%) / FiO2 */
  sf: number;
  caveats: string[];
  basis: Basis;
}

/** A P/F imputed from S/F, or the reason none can be: never a number the method cannot stand behind. */
export type PfImputation =
  | (PfImputationCommon & {
      valid: true;
      /** mmHg */
      pf: number;
      /** the PaO2 the imputed P/F implies at this FiO2, mmHg */
      pao2: number;
    })
  | (PfImputationCommon & { valid: false; pf: null; pao2: null; reason: string });

const whole = (value: number) => String(Math.round(value));

/**
 * P/F imputed from SpO2 and FiO2, with its basis.
 * - `linear` (Rice et al. 2007; SOURCES.linearPfImputation):
 *   P/F = (S/F − 64) / 0.84, valid for SpO2 ≤ 97 %.
 * - `nonlinear` (Brown et al. 2016; SOURCES.nonlinearPfImputation): PaO2 from
 *   SpO2 on the engine's Severinghaus curve by Ellis's exact inverse, then
 *   PaO2 / FiO2; valid for SpO2 ≤ 96 %.
 * Outside its range a method answers `valid: false` with the reason in words;
 * a linear result implying a PaO2 below any live arterial value (10 mmHg) is
 * refused the same way. SpO2 outside 40–100 % or FiO2 outside 0.21–1 throws.
 */
export function imputePfFromSf({
  spo2,
  fio2,
  method,
}: {
  /** % */
  spo2: number;
  fio2: number;
  method: PfImputationMethod;
}): PfImputation {
  checkChoice("method", method, METHODS);
  checkRange("spo2", spo2, RANGES.spo2Index);
  checkRange("fio2", fio2, RANGES.fio2);
  const sf = spo2 / fio2;
  const caveats: string[] = [
    "Pulse oximetry differs from arterial saturation by a few percent, more in poor perfusion and in darker skin; a measured PaO2 decides.",
  ];
  if (belowOximeterAccuracy(spo2))
    caveats.push(
      `SpO2 ${spo2} % is ${BELOW_OXIMETER_ACCURACY_LABEL}: the imputed P/F carries its error.`,
    );
  const inputs: Basis["inputs"] = {
    SpO2: { value: spo2, unit: "%" },
    FiO2: { value: fio2, unit: "fraction" },
  };
  const common = { method, sf, caveats };
  const refuse = (reason: string, basis: Basis): PfImputation => ({
    ...common,
    valid: false,
    pf: null,
    pao2: null,
    reason,
    basis,
  });

  if (method === "linear") {
    const basis: Basis = {
      name: "P/F imputed from S/F (linear)",
      formula: `P/F = (S/F − ${RICE_INTERCEPT}) / ${RICE_SLOPE}, S/F = SpO2 (%) / FiO2`,
      inputs,
      source: SOURCES.linearPfImputation,
      assumptions: [
        `Valid only with SpO2 ≤ ${HIGHEST_SPO2_FOR_LINEAR_IMPUTING} %, the range the equation was derived from.`,
        "A regression over a population: one patient's P/F may lie far from the line.",
      ],
    };
    if (spo2 > HIGHEST_SPO2_FOR_LINEAR_IMPUTING) {
      return refuse(
        `SpO2 ${spo2} % is above ${HIGHEST_SPO2_FOR_LINEAR_IMPUTING} %: on the flat top of the dissociation curve S/F no longer follows P/F, and the linear equation was derived from SpO2 ≤ ${HIGHEST_SPO2_FOR_LINEAR_IMPUTING} % only.`,
        basis,
      );
    }
    if (sf <= RICE_INTERCEPT) {
      return refuse(
        `S/F ${whole(sf)} is not above the linear equation's intercept (${RICE_INTERCEPT}): it gives no positive P/F.`,
        basis,
      );
    }
    const pf = (sf - RICE_INTERCEPT) / RICE_SLOPE;
    const pao2 = pf * fio2;
    if (pao2 < RANGES.pao2.min) {
      return refuse(
        `S/F ${whole(sf)} gives P/F ${whole(pf)} mmHg by the linear equation, a PaO2 of ${whole(pao2)} mmHg at FiO2 ${fio2}: below any live arterial value (${RANGES.pao2.min} mmHg), so the equation does not describe this reading.`,
        basis,
      );
    }
    return { ...common, valid: true, pf, pao2, basis };
  }

  const basis: Basis = {
    name: "P/F imputed from S/F (non-linear)",
    formula:
      "PaO2 from SpO2 on the Severinghaus curve (Ellis's inverse: A = 11700 / (1/SO2 − 1), B = √(50³ + A²), PaO2 = ∛(B + A) − ∛(B − A)); P/F = PaO2 / FiO2",
    inputs,
    source: `${SOURCES.nonlinearPfImputation}; ${SOURCES.severinghaus}; ${SOURCES.ellis}`,
    assumptions: [
      `Valid only with SpO2 ≤ ${HIGHEST_SPO2_FOR_IMPUTING} %: above it the curve is too flat to read a PaO2 from.`,
      "The standard curve: 37 °C, pH 7.40, P50 26.8 mmHg; fever, acidosis or abnormal haemoglobin shift it.",
    ],
  };
  if (spo2 > HIGHEST_SPO2_FOR_IMPUTING) {
    return refuse(
      `SpO2 ${spo2} % is above ${HIGHEST_SPO2_FOR_IMPUTING} %, where the dissociation curve is too flat to impute PaO2: each point of SpO2 there spans 10 mmHg of PaO2 or more, and a reading of 100 % fits any PaO2 from about 200 mmHg up.`,
      basis,
    );
  }
  const pao2 = po2FromSaturation(spo2 / 100);
  return { ...common, valid: true, pf: pao2 / fio2, pao2, basis };
}

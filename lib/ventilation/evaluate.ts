import {
  drivingPressure,
  IDEAL_PACO2,
  mechanicalPower,
  predictedBodyWeight,
  PREDICTED_MINUTE_VENTILATION_PER_KG,
  SOURCES,
  staticCompliance,
  tidalVolumePerKg,
  ventilatoryRatio,
  type IndexValue,
  type Sex,
} from "../oxygen";
import type { VentMode } from "./settings";

// What Tidemark computes from one ventilator check, each number with its
// basis (inputs, formula, source, assumptions), and which of the order's
// lung-protective limits it is beyond. Pure; the engine checks every input.

/** One check as measured at the ventilator (pressures in cmH2O, volumes in mL). */
export type CheckValues = {
  measuredVtMl: number;
  measuredRate: number;
  totalPeep: number;
  minuteVentilationLMin?: number | undefined;
  peakPressure?: number | undefined;
  plateauPressure?: number | undefined;
};

/** PaCO2 of the latest arterial gas at or before the check, when one is recent enough. */
export type CheckGas = { paco2: number; sampledAt: string };

export type CheckIndices = {
  predictedBodyWeight: IndexValue;
  vtPerKg: IndexValue;
  drivingPressure?: IndexValue;
  staticCompliance?: IndexValue;
  mechanicalPower?: IndexValue;
  ventilatoryRatio?: IndexValue;
};

const PBW_FORMULA = "PBW = 50 (male) or 45.5 (female) + 0.91 × (height cm − 152.4)";

/** Every index the check's inputs allow; an index whose inputs were not measured is left out. */
export function evaluateCheck(
  values: CheckValues,
  patient: { heightCm: number; sex: Sex },
  mode: VentMode,
  gas: CheckGas | null,
): CheckIndices {
  const pbw = predictedBodyWeight(patient);
  const height = { value: patient.heightCm, unit: "cm" };
  const sexWords = `Sex recorded as ${patient.sex}: base ${patient.sex === "male" ? "50" : "45.5"} kg.`;
  const VT = { value: values.measuredVtMl, unit: "mL" };
  const PBW = { value: round(pbw, 1), unit: "kg" };
  const PEEP = { value: values.totalPeep, unit: "cmH2O" };
  const indices: CheckIndices = {
    predictedBodyWeight: {
      value: pbw,
      unit: "kg",
      basis: {
        name: "Predicted body weight",
        formula: PBW_FORMULA,
        inputs: { height },
        source: SOURCES.predictedBodyWeight,
        assumptions: [sexWords, "Height and sex as recorded for the patient; never estimated."],
      },
    },
    vtPerKg: {
      value: tidalVolumePerKg({ tidalVolumeMl: values.measuredVtMl, ...patient }),
      unit: "mL/kg",
      basis: {
        name: "Tidal volume per kg PBW",
        formula: `VT/kg = VT (mL) / PBW (kg); ${PBW_FORMULA}`,
        inputs: { VT, PBW },
        source: SOURCES.predictedBodyWeight,
        assumptions: ["VT is the measured (exhaled) tidal volume."],
      },
    },
  };
  const plateau = values.plateauPressure;
  if (plateau !== undefined) {
    const Pplat = { value: plateau, unit: "cmH2O" };
    const dp = drivingPressure({ plateauPressure: plateau, peep: values.totalPeep });
    indices.drivingPressure = {
      value: dp,
      unit: "cmH2O",
      basis: {
        name: "Driving pressure",
        formula: "ΔP = Pplat − PEEP (total)",
        inputs: { Pplat, PEEP },
        source: SOURCES.drivingPressure,
        assumptions: [
          "Plateau pressure from an end-inspiratory hold; total PEEP from an end-expiratory hold (set PEEP plus any auto-PEEP).",
          ...(mode === "volume_control"
            ? []
            : [
                "Outside volume control a plateau needs a hold with no patient effort to mean this.",
              ]),
        ],
      },
    };
    indices.staticCompliance = {
      value: staticCompliance({
        tidalVolumeMl: values.measuredVtMl,
        plateauPressure: plateau,
        peep: values.totalPeep,
      }),
      unit: "mL/cmH2O",
      basis: {
        name: "Static compliance",
        formula: "Cstat = VT / (Pplat − PEEP)",
        inputs: { VT, Pplat, PEEP },
        source: SOURCES.staticCompliance,
        assumptions: ["Respiratory system (lung and chest wall) together."],
      },
    };
    if (values.peakPressure !== undefined) {
      indices.mechanicalPower = {
        value: mechanicalPower({
          respiratoryRate: values.measuredRate,
          tidalVolumeMl: values.measuredVtMl,
          peakPressure: values.peakPressure,
          plateauPressure: plateau,
          peep: values.totalPeep,
        }),
        unit: "J/min",
        basis: {
          name: "Mechanical power (simplified)",
          formula: "MP = 0.098 × RR × VT (L) × (Ppeak − ½ × (Pplat − PEEP))",
          inputs: {
            RR: { value: values.measuredRate, unit: "/min" },
            VT,
            Ppeak: { value: values.peakPressure, unit: "cmH2O" },
            Pplat,
            PEEP,
          },
          source: SOURCES.mechanicalPower,
          assumptions: [
            "0.098 converts L·cmH2O to J.",
            mode === "volume_control"
              ? "The simplified equation is for volume-controlled ventilation, as here."
              : "The simplified equation is for volume-controlled ventilation; in this mode it is an approximation.",
          ],
        },
      };
    }
  }
  if (gas !== null) {
    const measuredVe = values.minuteVentilationLMin;
    // Without a measured minute ventilation, VT × rate stands in for it (said in the basis).
    const ve = measuredVe ?? (values.measuredVtMl * values.measuredRate) / 1000;
    indices.ventilatoryRatio = {
      value: ventilatoryRatio({
        minuteVentilationLMin: ve,
        paco2: gas.paco2,
        predictedBodyWeightKg: pbw,
      }),
      unit: "ratio",
      basis: {
        name: "Ventilatory ratio",
        formula: `VR = (VE (mL/min) × PaCO2) / (PBW × ${PREDICTED_MINUTE_VENTILATION_PER_KG} × ${IDEAL_PACO2})`,
        inputs: {
          VE: { value: round(ve, 2), unit: "L/min" },
          PaCO2: { value: gas.paco2, unit: "mmHg" },
          PBW,
        },
        source: SOURCES.ventilatoryRatio,
        assumptions: [
          `PaCO2 from the arterial gas sampled at ${gas.sampledAt}, the latest before this check.`,
          measuredVe === undefined
            ? "Minute ventilation not recorded: VT × rate used in its place."
            : "Minute ventilation as measured by the ventilator.",
        ],
      },
    };
  }
  return indices;
}

/** The order's lung-protective limits a check is held against. */
export type LungProtectionLimits = {
  vtMaxMlKg: number;
  plateauLimit: number;
  drivingLimit: number;
};

/** One limit a check is beyond: what, the value (rounded as shown) and the limit. */
export type Breach = {
  what: "vt_per_kg" | "plateau" | "driving_pressure";
  value: number;
  limit: number;
  unit: string;
};

const BREACH_WORDS: Record<Breach["what"], string> = {
  vt_per_kg: "VT",
  plateau: "plateau pressure",
  driving_pressure: "driving pressure",
};

/**
 * The limits a check is beyond: VT/kg above the order's target range, plateau
 * above its limit, driving pressure above its limit. Compared as shown (VT/kg
 * to one decimal), so what the screen shows and what alerts agree.
 */
export function lungProtectionBreaches(
  indices: CheckIndices,
  values: Pick<CheckValues, "plateauPressure">,
  limits: LungProtectionLimits,
): Breach[] {
  const breaches: Breach[] = [];
  const vtPerKg = round(indices.vtPerKg.value, 1);
  if (vtPerKg > limits.vtMaxMlKg)
    breaches.push({
      what: "vt_per_kg",
      value: vtPerKg,
      limit: limits.vtMaxMlKg,
      unit: "mL/kg PBW",
    });
  if (values.plateauPressure !== undefined && values.plateauPressure > limits.plateauLimit)
    breaches.push({
      what: "plateau",
      value: values.plateauPressure,
      limit: limits.plateauLimit,
      unit: "cmH2O",
    });
  if (indices.drivingPressure) {
    const dp = round(indices.drivingPressure.value, 1);
    if (dp > limits.drivingLimit)
      breaches.push({
        what: "driving_pressure",
        value: dp,
        limit: limits.drivingLimit,
        unit: "cmH2O",
      });
  }
  return breaches;
}

/** "plateau pressure 33 cmH2O (limit 30)" — one breach in words, for alerts and e-mail. */
export function breachWords(b: Breach): string {
  const limit = b.what === "vt_per_kg" ? `target range up to ${b.limit}` : `limit ${b.limit}`;
  return `${BREACH_WORDS[b.what]} ${b.value} ${b.unit} (${limit})`;
}

function round(v: number, digits: number): number {
  const f = 10 ** digits;
  return Math.round(v * f) / f;
}

import {
  classifyOxygenation,
  type OxygenationClassification,
  type RespiratorySupport,
} from "./classification";
import {
  HEMOGLOBIN_OXYGEN_CAPACITY,
  OXYGEN_SOLUBILITY,
  oxygenContentParts,
  oxygenDelivery,
} from "./content";
import { saturationFromPO2 } from "./dissociation";
import {
  alveolarPO2,
  BODY_WATER_VAPOUR_PRESSURE,
  DEFAULT_RESPIRATORY_QUOTIENT,
  STANDARD_BAROMETRIC_PRESSURE,
} from "./gas";
import {
  expectedAaGradient,
  oxygenationIndex,
  oxygenSaturationIndex,
  pfRatio,
  roxIndex,
  sfRatio,
} from "./indices";
import {
  BELOW_OXIMETER_ACCURACY_LABEL,
  belowOximeterAccuracy,
  OXIMETER_ACCURATE_FROM_PCT,
} from "./oximetry";
import { checkRange, type InputRange, RANGES } from "./ranges";
import { SOURCES } from "./sources";

/** How a number was obtained, for the UI's basis view: enough to check it by hand. */
export interface Basis {
  name: string;
  /** plain text */
  formula: string;
  inputs: Record<string, { value: number; unit: string }>;
  source: string;
  assumptions: string[];
}

export interface IndexValue {
  value: number;
  unit: string;
  basis: Basis;
}

export interface BloodGasInput {
  fio2: number;
  /** mmHg */
  pao2: number;
  /** mmHg */
  paco2: number;
  /** g/dL */
  hemoglobin?: number;
  /** pulse oximetry, % */
  spo2?: number;
  /** measured arterial saturation (co-oximetry), fraction */
  sao2?: number;
  /** PEEP, CPAP or EPAP, cmH2O */
  peep?: number;
  /** cmH2O */
  meanAirwayPressure?: number;
  /** /min */
  respiratoryRate?: number;
  /** mmHg; 760 if omitted */
  barometricPressure?: number;
  support?: RespiratorySupport;
  /** HFNC flow, L/min */
  flow?: number;
  /** years, for the expected A–a gradient */
  ageYears?: number;
  /** L/min, for oxygen delivery */
  cardiacOutput?: number;
}

export interface BloodGasAssessment {
  indices: {
    pfRatio: IndexValue;
    alveolarPO2: IndexValue;
    alveolarArterialGradient: IndexValue;
    expectedAlveolarArterialGradient?: IndexValue;
    arterialAlveolarRatio: IndexValue;
    sfRatio?: IndexValue;
    oxygenContent?: {
      total: IndexValue;
      bound: IndexValue;
      dissolved: IndexValue;
      boundToDissolvedRatio: IndexValue;
    };
    oxygenDelivery?: IndexValue;
    oxygenationIndex?: IndexValue;
    oxygenSaturationIndex?: IndexValue;
    roxIndex?: IndexValue;
  };
  classification: OxygenationClassification;
  /** The measured PaO2 is above the computed PAO2. */
  inconsistent: boolean;
  caveats: string[];
}

type Inputs = Basis["inputs"];
const index = (value: number, unit: string, basis: Basis): IndexValue => ({ value, unit, basis });

/**
 * Every applicable oxygenation index of one blood gas, each with its value,
 * unit and basis (inputs, formula, source, assumptions), the Berlin and global
 * classification, and caveats. Indices whose inputs are missing are left out.
 */
export function assessBloodGas(input: BloodGasInput): BloodGasAssessment {
  const {
    fio2,
    pao2,
    paco2,
    hemoglobin,
    spo2,
    sao2,
    peep,
    meanAirwayPressure,
    respiratoryRate,
    barometricPressure = STANDARD_BAROMETRIC_PRESSURE,
    support,
    flow,
    ageYears,
    cardiacOutput,
  } = input;
  // Every input given is checked, even one no index ends up using.
  const optional: Array<[string, number | undefined, InputRange]> = [
    ["hemoglobin", hemoglobin, RANGES.hemoglobin],
    ["spo2", spo2, RANGES.spo2],
    ["sao2", sao2, RANGES.saturationFraction],
    ["peep", peep, RANGES.peep],
    ["meanAirwayPressure", meanAirwayPressure, RANGES.meanAirwayPressure],
    ["respiratoryRate", respiratoryRate, RANGES.respiratoryRate],
    ["flow", flow, RANGES.flow],
    ["ageYears", ageYears, RANGES.ageYears],
    ["cardiacOutput", cardiacOutput, RANGES.cardiacOutput],
  ];
  for (const [field, value, range] of optional)
    if (value !== undefined) checkRange(field, value, range);
  const caveats: string[] = [];
  const FiO2 = { value: fio2, unit: "fraction" };
  const PaO2 = { value: pao2, unit: "mmHg" };
  const PaCO2 = { value: paco2, unit: "mmHg" };

  const pf = pfRatio(pao2, fio2);
  const alveolar = alveolarPO2({ fio2, paco2, barometricPressure });
  const alveolarInputs: Inputs = {
    FiO2,
    PaCO2,
    PB: { value: barometricPressure, unit: "mmHg" },
    PH2O: { value: BODY_WATER_VAPOUR_PRESSURE, unit: "mmHg" },
    R: { value: DEFAULT_RESPIRATORY_QUOTIENT, unit: "ratio" },
  };
  const alveolarAssumptions = [
    `Water vapour pressure ${BODY_WATER_VAPOUR_PRESSURE} mmHg (37 °C) and respiratory quotient ${DEFAULT_RESPIRATORY_QUOTIENT}.`,
    "Simplified equation: ignores the small correction for unequal inspired and expired volumes.",
  ];
  const inconsistent = pao2 > alveolar;
  if (inconsistent) {
    caveats.push(
      `Measured PaO2 ${Math.round(pao2)} mmHg is above the computed PAO2 ${Math.round(alveolar)} mmHg: inconsistent ` +
        "(check FiO2, PaCO2, barometric pressure and that the sample is arterial). A–a gradient and a/A ratio are not interpretable.",
    );
  }

  const indices: BloodGasAssessment["indices"] = {
    pfRatio: index(pf, "mmHg", {
      name: "P/F ratio",
      formula: "P/F = PaO2 / FiO2",
      inputs: { PaO2, FiO2 },
      source: SOURCES.pfRatio,
      assumptions: [
        "FiO2 is the fraction actually delivered; on low-flow devices it is an estimate.",
      ],
    }),
    alveolarPO2: index(alveolar, "mmHg", {
      name: "Alveolar PO2 (PAO2)",
      formula: "PAO2 = FiO2 × (PB − PH2O) − PaCO2 / R",
      inputs: alveolarInputs,
      source: SOURCES.alveolarGas,
      assumptions: alveolarAssumptions,
    }),
    alveolarArterialGradient: index(alveolar - pao2, "mmHg", {
      name: "A–a gradient",
      formula: "A–a = PAO2 − PaO2",
      inputs: { PAO2: { value: alveolar, unit: "mmHg" }, PaO2 },
      source: SOURCES.alveolarArterial,
      assumptions: [...alveolarAssumptions, "The normal gradient rises with age and with FiO2."],
    }),
    arterialAlveolarRatio: index(pao2 / alveolar, "ratio", {
      name: "a/A ratio",
      formula: "a/A = PaO2 / PAO2",
      inputs: { PaO2, PAO2: { value: alveolar, unit: "mmHg" } },
      source: SOURCES.arterialAlveolarRatio,
      assumptions: alveolarAssumptions,
    }),
  };

  if (ageYears !== undefined) {
    indices.expectedAlveolarArterialGradient = index(expectedAaGradient(ageYears), "mmHg", {
      name: "Expected A–a gradient for age",
      formula: "age / 4 + 4",
      inputs: { age: { value: ageYears, unit: "years" } },
      source: SOURCES.expectedAaGradient,
      assumptions: ["Applies to room air; the gradient widens at higher FiO2."],
    });
  }

  // Any SpO2 an oximeter shows is accepted; the indices built on it need one
  // at or above their floor (RANGES.spo2Index), and are marked below 70 %.
  const indexSpo2 = spo2 !== undefined && spo2 >= RANGES.spo2Index.min ? spo2 : undefined;
  if (spo2 !== undefined && belowOximeterAccuracy(spo2)) {
    caveats.push(
      indexSpo2 === undefined
        ? `SpO2 ${spo2} % is ${BELOW_OXIMETER_ACCURACY_LABEL} and under ${RANGES.spo2Index.min} %: S/F, OSI, ROX and the S/F criterion are not computed from it.`
        : `SpO2 ${spo2} % is ${BELOW_OXIMETER_ACCURACY_LABEL} (under ${OXIMETER_ACCURATE_FROM_PCT} %): S/F, OSI and ROX carry its error; confirm with a measured SaO2.`,
    );
  }
  if (indexSpo2 !== undefined) {
    indices.sfRatio = index(sfRatio(indexSpo2, fio2), "ratio", {
      name: "S/F ratio",
      formula: "S/F = SpO2 (%) / FiO2",
      inputs: { SpO2: { value: indexSpo2, unit: "%" }, FiO2 },
      source: SOURCES.sfRatio,
      assumptions: ["Valid only with SpO2 ≤ 97 %; above it the curve is flat and S/F says little."],
    });
    if (indexSpo2 > 97)
      caveats.push(`SpO2 ${indexSpo2} % is above 97 %: the S/F ratio is not interpretable.`);
  }
  if (spo2 !== undefined) {
    const expected = 100 * saturationFromPO2(pao2);
    if (Math.abs(expected - spo2) > 4) {
      caveats.push(
        `SpO2 ${spo2} % differs from the ${Math.round(expected)} % the standard curve gives at PaO2 ${Math.round(pao2)} mmHg: ` +
          "check the probe and the sample, and consider dyshaemoglobins or a shifted curve.",
      );
    }
  }

  if (hemoglobin !== undefined) {
    const [saturation, saturationNote] =
      sao2 !== undefined
        ? [sao2, "SaO2 measured by co-oximetry."]
        : spo2 !== undefined
          ? [
              spo2 / 100,
              "SaO2 taken from SpO2 (pulse oximetry), which can differ from arterial saturation by several percent.",
            ]
          : [
              saturationFromPO2(pao2),
              "SaO2 computed from PaO2 on the standard Severinghaus curve (no measured saturation).",
            ];
    const parts = oxygenContentParts({ hemoglobin, saturation, po2: pao2 });
    const contentInputs: Inputs = {
      Hb: { value: hemoglobin, unit: "g/dL" },
      SaO2: { value: saturation, unit: "fraction" },
      PaO2,
    };
    const contentAssumptions = [
      `${HEMOGLOBIN_OXYGEN_CAPACITY} mL O2 per g of haemoglobin (clinical value; 1.39 in theory).`,
      `${OXYGEN_SOLUBILITY} mL O2 per dL per mmHg dissolved at 37 °C.`,
      saturationNote,
    ];
    const contentBasis = (name: string, formula: string): Basis => ({
      name,
      formula,
      inputs: contentInputs,
      source: SOURCES.oxygenContent,
      assumptions: contentAssumptions,
    });
    indices.oxygenContent = {
      total: index(
        parts.total,
        "mL/dL",
        contentBasis("Arterial O2 content (CaO2)", "CaO2 = 1.34 × Hb × SaO2 + 0.003 × PaO2"),
      ),
      bound: index(
        parts.bound,
        "mL/dL",
        contentBasis("O2 bound to haemoglobin", "1.34 × Hb × SaO2"),
      ),
      dissolved: index(
        parts.dissolved,
        "mL/dL",
        contentBasis("O2 dissolved in plasma", "0.003 × PaO2"),
      ),
      boundToDissolvedRatio: index(
        parts.bound / parts.dissolved,
        "ratio",
        contentBasis("Bound to dissolved O2", "(1.34 × Hb × SaO2) / (0.003 × PaO2)"),
      ),
    };
    if (cardiacOutput !== undefined) {
      indices.oxygenDelivery = index(
        oxygenDelivery({ cardiacOutput, arterialContent: parts.total }),
        "mL/min",
        {
          name: "O2 delivery (DO2)",
          formula: "DO2 = 10 × CO × CaO2",
          inputs: {
            CO: { value: cardiacOutput, unit: "L/min" },
            CaO2: { value: parts.total, unit: "mL/dL" },
          },
          source: SOURCES.oxygenDelivery,
          assumptions: ["10 dL per litre of blood."],
        },
      );
    }
  }

  if (meanAirwayPressure !== undefined) {
    const MAP = { value: meanAirwayPressure, unit: "cmH2O" };
    const percentAssumption = "FiO2 enters as a percentage, as published.";
    indices.oxygenationIndex = index(
      oxygenationIndex({ fio2, meanAirwayPressure, pao2 }),
      "index",
      {
        name: "Oxygenation index (OI)",
        formula: "OI = FiO2 (%) × MAP / PaO2",
        inputs: { FiO2, MAP, PaO2 },
        source: SOURCES.oxygenationIndex,
        assumptions: [percentAssumption, "Validated mainly in invasively ventilated children."],
      },
    );
    if (indexSpo2 !== undefined) {
      const osi = oxygenSaturationIndex({ fio2, meanAirwayPressure, spo2: indexSpo2 });
      indices.oxygenSaturationIndex = index(osi, "index", {
        name: "Oxygen saturation index (OSI)",
        formula: "OSI = FiO2 (%) × MAP / SpO2 (%)",
        inputs: { FiO2, MAP, SpO2: { value: indexSpo2, unit: "%" } },
        source: SOURCES.oxygenSaturationIndex,
        assumptions: [percentAssumption, "Valid only with SpO2 ≤ 97 %."],
      });
    }
  }

  if (indexSpo2 !== undefined && respiratoryRate !== undefined) {
    indices.roxIndex = index(roxIndex({ spo2: indexSpo2, fio2, respiratoryRate }), "index", {
      name: "ROX index",
      formula: "ROX = (SpO2 (%) / FiO2) / RR",
      inputs: {
        SpO2: { value: indexSpo2, unit: "%" },
        FiO2,
        RR: { value: respiratoryRate, unit: "/min" },
      },
      source: SOURCES.rox,
      assumptions: ["Validated in patients on high-flow nasal oxygen."],
    });
    if (support !== "hfnc")
      caveats.push("The ROX index is validated on high-flow nasal oxygen only.");
  }

  const classification = classifyOxygenation({
    pao2,
    spo2: indexSpo2,
    fio2,
    peep,
    support,
    flow,
    barometricPressure,
  });
  return { indices, classification, inconsistent, caveats };
}

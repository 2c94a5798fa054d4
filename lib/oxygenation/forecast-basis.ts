import {
  ASSUMED_ARTERIOVENOUS_DIFFERENCE,
  type Basis,
  BODY_WATER_VAPOUR_PRESSURE,
  DEFAULT_RESPIRATORY_QUOTIENT,
  type Fio2Forecast,
  FORECAST_ASSUMPTIONS,
  type ForecastInput,
  SOURCES,
  STANDARD_BAROMETRIC_PRESSURE,
} from "../oxygen";

/** The basis of every number a FiO2 forecast shows, for the basis view and the API. */
export interface ForecastBasis {
  pf: Basis;
  alveolarArterialRatio: Basis;
  shunt: Basis;
  alveolarPO2: Basis;
  spo2: Basis;
  range: Basis;
}

const UNCHANGED =
  "PEEP, cardiac output, haemoglobin, PaCO2, respiratory quotient and ventilation–perfusion matching are assumed unchanged.";

/**
 * Names, formulas, inputs, sources and assumptions of the three forecast
 * models (lib/oxygen forecastFio2Change), built from the same input and result.
 */
export function forecastBasis(input: ForecastInput, forecast: Fio2Forecast): ForecastBasis {
  const pb = input.barometricPressure ?? STANDARD_BAROMETRIC_PRESSURE;
  const FiO2 = { value: input.fio2, unit: "fraction" };
  const next = { value: input.nextFio2, unit: "fraction" };
  const PaO2 = { value: input.pao2, unit: "mmHg" };
  const PAO2 = { value: forecast.alveolarPO2.current, unit: "mmHg" };
  const PAO2next = { value: forecast.alveolarPO2.next, unit: "mmHg" };
  return {
    pf: {
      name: "Constant P/F model",
      formula: "PaO2 new = PaO2 × FiO2 new / FiO2, capped at PAO2 new",
      inputs: { PaO2, FiO2, "FiO2 new": next, "PAO2 new": PAO2next },
      source: SOURCES.pfRatio,
      assumptions: ["The P/F ratio stays as measured when FiO2 changes.", UNCHANGED],
    },
    alveolarArterialRatio: {
      name: "Constant a/A ratio model",
      formula: "PaO2 new = (PaO2 / PAO2) × PAO2 new",
      inputs: { PaO2, PAO2, "PAO2 new": PAO2next },
      source: SOURCES.arterialAlveolarRatio,
      assumptions: ["The a/A ratio stays as measured (capped at 1).", UNCHANGED],
    },
    shunt: {
      name: "Shunt model",
      formula:
        "Qs/Qt = (Cc'O2 − CaO2) / (Cc'O2 − CvO2), CvO2 = CaO2 − a–v difference; " +
        "solve CaO2 new = (1 − Qs/Qt) × Cc'O2 new + Qs/Qt × CvO2 new for PaO2 new",
      inputs: {
        PaO2,
        PAO2,
        "PAO2 new": PAO2next,
        Hb: { value: input.hemoglobin, unit: "g/dL" },
        "Qs/Qt": { value: forecast.shuntFraction, unit: "fraction" },
        "a–v difference": { value: ASSUMED_ARTERIOVENOUS_DIFFERENCE, unit: "mL/dL" },
      },
      source: `${SOURCES.shunt}; ${SOURCES.oxygenContent}`,
      assumptions: [
        "End-capillary PO2 equals PAO2; contents from CaO2 = 1.34 × Hb × SO2 + 0.003 × PO2 on the Severinghaus curve.",
        `Arterio-venous O2 content difference assumed ${ASSUMED_ARTERIOVENOUS_DIFFERENCE} mL/dL, and the shunt fraction, kept at the new FiO2.`,
        UNCHANGED,
      ],
    },
    alveolarPO2: {
      name: "Alveolar PO2 at each FiO2",
      formula: "PAO2 = FiO2 × (PB − PH2O) − PaCO2 / R",
      inputs: {
        FiO2,
        "FiO2 new": next,
        PaCO2: { value: input.paco2, unit: "mmHg" },
        PB: { value: pb, unit: "mmHg" },
        PH2O: { value: input.waterVapourPressure ?? BODY_WATER_VAPOUR_PRESSURE, unit: "mmHg" },
        R: { value: input.respiratoryQuotient ?? DEFAULT_RESPIRATORY_QUOTIENT, unit: "ratio" },
      },
      source: SOURCES.alveolarGas,
      assumptions: ["Simplified equation; water vapour at 37 °C."],
    },
    spo2: {
      name: "Forecast SpO2",
      formula: "SO2 = 1 / (23400 / (PO2³ + 150 × PO2) + 1)",
      inputs: {
        "PaO2 low": { value: forecast.range.low.pao2, unit: "mmHg" },
        "PaO2 high": { value: forecast.range.high.pao2, unit: "mmHg" },
      },
      source: SOURCES.severinghaus,
      assumptions: [
        "Standard curve: 37 °C, pH 7.40, base excess 0, P50 26.8 mmHg; curve shifts are not modelled.",
      ],
    },
    range: {
      name: "Forecast range",
      formula: "lowest to highest PaO2 of the three models",
      inputs: {
        "constant P/F": { value: forecast.models.pf.pao2, unit: "mmHg" },
        "constant a/A": { value: forecast.models.alveolarArterialRatio.pao2, unit: "mmHg" },
        shunt: { value: forecast.models.shunt.pao2, unit: "mmHg" },
      },
      source: `${SOURCES.pfRatio}; ${SOURCES.arterialAlveolarRatio}; ${SOURCES.shunt}`,
      assumptions: [...FORECAST_ASSUMPTIONS],
    },
  };
}

/**
 * Tidemark's oxygenation engine: pure functions over published methods. Every
 * function refuses non-finite or out-of-range input with an OxygenInputError.
 * Pressures in mmHg, FiO2 and saturations as fractions, arguments named spo2 in %.
 */
export const ENGINE_VERSION = "1.0.0";

export {
  OxygenInputError,
  OxygenChoiceError,
  type OxygenInputErrorDetails,
  type OxygenChoiceErrorDetails,
} from "./errors";
export {
  RANGES,
  MIN_ALVEOLAR_PO2,
  betweenWords,
  rangeRefusal,
  unitSuffix,
  type InputRange,
  type ClinicalRange,
  type RangeKey,
} from "./ranges";
export { SOURCES } from "./sources";
export {
  OXIMETER_ACCURATE_FROM_PCT,
  BELOW_OXIMETER_ACCURACY_LABEL,
  belowOximeterAccuracy,
  onSupplementalOxygen,
} from "./oximetry";
export {
  MMHG_PER_KPA,
  HEMOGLOBIN_MONOMER_MOLAR_MASS,
  toMmHg,
  fromMmHg,
  convertPressure,
  pressureIn,
  restatePressureRange,
  convertHemoglobin,
  roundInward,
  toGramsPerDecilitre,
  fromGramsPerDecilitre,
  formatPressure,
  formatPfRatio,
  type PressureUnit,
  type HemoglobinUnit,
} from "./units";
export {
  STANDARD_BAROMETRIC_PRESSURE,
  BODY_WATER_VAPOUR_PRESSURE,
  DEFAULT_RESPIRATORY_QUOTIENT,
  partialPressure,
  inspiredPO2,
  alveolarPO2,
  barometricPressureAtAltitude,
  type InspiredGasInput,
  type AlveolarGasInput,
} from "./gas";
export { saturationFromPO2, po2FromSaturation } from "./dissociation";
export {
  HEMOGLOBIN_OXYGEN_CAPACITY,
  OXYGEN_SOLUBILITY,
  dissolvedOxygen,
  oxygenContent,
  oxygenContentParts,
  oxygenDelivery,
  type OxygenContentInput,
  type OxygenContentParts,
} from "./content";
export {
  pfRatio,
  sfRatio,
  roxIndex,
  oxygenationIndex,
  oxygenSaturationIndex,
  expectedAaGradient,
} from "./indices";
export {
  PREDICTED_MINUTE_VENTILATION_PER_KG,
  IDEAL_PACO2,
  RSBI_THRESHOLD,
  predictedBodyWeight,
  tidalVolumePerKg,
  drivingPressure,
  staticCompliance,
  mechanicalPower,
  ventilatoryRatio,
  rapidShallowBreathingIndex,
  type Sex,
  type MechanicalPowerInput,
} from "./ventilation";
export {
  RICE_INTERCEPT,
  RICE_SLOPE,
  HIGHEST_SPO2_FOR_LINEAR_IMPUTING,
  HIGHEST_SPO2_FOR_IMPUTING,
  imputePfFromSf,
  type PfImputationMethod,
  type PfImputation,
} from "./imputation";
export {
  CYLINDER_FACTORS,
  DEFAULT_CYLINDER_RESERVE_PSI,
  PSI_PER_BAR,
  cylinderDuration,
  type CylinderSize,
  type CylinderPressureUnit,
  type CylinderDurationInput,
  type CylinderDuration,
} from "./cylinder";
export {
  WEANING_THRESHOLDS,
  weaningScreen,
  type WeaningCriterionId,
  type WeaningCriterionStatus,
  type WeaningCriterion,
  type WeaningScreen,
  type WeaningScreenInput,
} from "./weaning";
export {
  classifyOxygenation,
  type RespiratorySupport,
  type BerlinCategory,
  type GlobalCategory,
  type ClassificationResult,
  type OxygenationClassification,
  type ClassifyOxygenationInput,
} from "./classification";
export {
  ASSUMED_HEMOGLOBIN,
  HEMOGLOBIN_ASSUMED_CAVEAT,
  forecastBaseline,
  type BaselineGas,
  ASSUMED_ARTERIOVENOUS_DIFFERENCE,
  FORECAST_ASSUMPTIONS,
  PEEP_NOT_FORECAST,
  forecastFio2Change,
  shuntArterialPO2,
  InconsistentBloodGasError,
  type ForecastInput,
  type ModelForecast,
  type Fio2Forecast,
} from "./forecast";
export {
  ardsNetworkTable,
  ardsNetworkTableSource,
  type SettingValue,
  type ArdsNetworkStep,
  type ArdsNetworkTableName,
} from "./step-tables";
export {
  ASSUMED_PACO2,
  DEFAULT_URGENCY,
  proposeStep,
  type Urgency,
  type OrderStep,
  type OrderLimits,
  type TitrationOrder,
  type CurrentSettings,
  type LatestReading,
  type LatestBloodGas,
  type ProposeStepInput,
  type ProposalDirection,
  type ProposedSetting,
  type Proposal,
} from "./propose-step";
export {
  assessBloodGas,
  type Basis,
  type IndexValue,
  type BloodGasInput,
  type BloodGasAssessment,
} from "./basis";

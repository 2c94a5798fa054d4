/**
 * The code systems, codes and units the FHIR R4 export uses, in one place.
 *
 * Each LOINC code names its source beside it: the LOINC long common name it
 * carries, and a published FHIR profile, value set or example that uses the
 * code where one was found. A display or code marked "(recollection)" was
 * written from memory and not seen in a published text. The SNOMED CT concept
 * is still marked for checking against the SNOMED CT browser. UCUM unit codes
 * are checked by the tests with the NLM's UCUM implementation (@lhncbc/ucum-lhc).
 *
 * Published texts cited below:
 * - FHIR R4 Oxygen Saturation profile (hl7.org/fhir/R4/oxygensat.html):
 *   Observation.code fixed to LOINC 2708-6.
 * - US Core Pulse Oximetry profile (hl7.org/fhir/us/core, STU5–STU7,
 *   StructureDefinition-us-core-pulse-oximetry): code slices 59408-5
 *   ("PulseOx") and 2708-6 ("O2Sat"); its satO2-fiO2 example carries a 3151-8
 *   flow-rate component. (Its 3150-0 concentration component: recollection.)
 * - HL7 SANER IG 1.0.0, ValueSet VentilatorObservations: 19994-3 and 20077-4;
 *   its example Observations code 19994-3 as "Oxygen/Inspired gas setting
 *   [Volume Fraction] Ventilator".
 * - FHIR value set diagnostic-requests (hl7.org/fhir/DSTU2): the gas panels
 *   24336-0 "Gas panel - Arterial blood" and 24337-8 "Gas panel - Capillary blood".
 * - HL7 MCC eCare Plan IG 1.0.0, example arterial-blood-gas-panel: 24336-0 with
 *   members 2703-7 and 2019-8.
 * - German Medical Informatics Initiative ICU module: 76248-4 "PEEP
 *   Respiratory system --on ventilator" for the measured PEEP.
 */

/** Code system and identifier system URIs. */
export const FHIR_SYSTEMS = {
  loinc: "http://loinc.org",
  ucum: "http://unitsofmeasure.org",
  snomed: "http://snomed.info/sct",
  observationCategory: "http://terminology.hl7.org/CodeSystem/observation-category",
  identifierType: "http://terminology.hl7.org/CodeSystem/v2-0203",
  // Local systems. A URN keeps them unique to Tidemark without claiming a web
  // address; a hospital that has its own OID or URL for MRNs can swap it here.
  mrn: "urn:tidemark:mrn",
  order: "urn:tidemark:order",
  observation: "urn:tidemark:observation",
  device: "urn:tidemark:device",
  orderStatus: "urn:tidemark:order-status",
} as const;

/** One LOINC (or SNOMED CT) code with its display. */
export type Code = { code: string; display: string };

/**
 * LOINC codes. Blood-gas members differ by specimen: arterial and venous
 * samples have their own codes, so a venous PO2 is never sent as an arterial
 * one.
 */
export const LOINC = {
  /**
   * LOINC 59408-5 "Oxygen saturation in Arterial blood by Pulse oximetry"; the
   * US Core Pulse Oximetry profile requires it beside 2708-6 on SpO2.
   */
  spo2: { code: "59408-5", display: "Oxygen saturation in Arterial blood by Pulse oximetry" },
  /**
   * LOINC 2708-6 "Oxygen saturation in Arterial blood": the code the FHIR R4
   * Oxygen Saturation profile fixes and US Core's "O2Sat" slice; sent beside
   * 59408-5 on SpO2.
   */
  oxygenSaturationArterial: { code: "2708-6", display: "Oxygen saturation in Arterial blood" },
  /** LOINC 9279-1 "Respiratory rate" (recollection; not checked here). */
  respiratoryRate: { code: "9279-1", display: "Respiratory rate" },
  /** LOINC 8867-4 "Heart rate" (recollection; not checked here). */
  pulseRate: { code: "8867-4", display: "Heart rate" },
  /**
   * LOINC 3150-0 "Inhaled oxygen concentration": the FiO2 in use beside a
   * reading or a gas, and a low-flow device's estimate. US Core Pulse Oximetry
   * defines itself as covering "inspired oxygen concentration observations";
   * that it names 3150-0 for them in %, and that 3150-0 is the FiO2 member of
   * the LOINC gas panels, are recollection.
   */
  inhaledOxygenConcentration: { code: "3150-0", display: "Inhaled oxygen concentration" },
  /**
   * LOINC 3151-8 "Inhaled oxygen flow rate": US Core Pulse Oximetry's flow
   * rate component (its satO2-fiO2 example sends 6 L/min).
   */
  inhaledOxygenFlowRate: { code: "3151-8", display: "Inhaled oxygen flow rate" },
  /**
   * LOINC 19994-3 "Oxygen/Inspired gas setting [Volume Fraction] Ventilator":
   * the FiO2 set on a ventilator, in the SANER IG's VentilatorObservations
   * value set (whose 1.0.0 expansion shows the later display "Oxygen/Total gas
   * setting [Volume Fraction] Ventilator"; same code). A measured inhaled O2
   * concentration stays 3150-0.
   */
  ventilatorFio2Setting: {
    code: "19994-3",
    display: "Oxygen/Inspired gas setting [Volume Fraction] Ventilator",
  },
  /**
   * LOINC 20077-4 "Positive end expiratory pressure setting Ventilator", in the
   * SANER IG's VentilatorObservations value set. The measured PEEP is 76248-4
   * "PEEP Respiratory system --on ventilator" (German Medical Informatics
   * Initiative ICU module); Tidemark records the set PEEP, so it sends 20077-4.
   */
  peepSetting: { code: "20077-4", display: "Positive end expiratory pressure setting Ventilator" },
  /**
   * LOINC 718-7 "Hemoglobin [Mass/volume] in Blood" (HL7 Switzerland CH
   * LAB-Order IG, ActivityDefinition procedure-hb). The arterial-blood term is
   * 30313-1 "Hemoglobin [Mass/volume] in Arterial blood" (display:
   * recollection); the export keeps 718-7, which does not claim a specimen.
   */
  hemoglobin: { code: "718-7", display: "Hemoglobin [Mass/volume] in Blood" },
} as const satisfies Record<string, Code>;

export type BloodGasMember = "ph" | "pco2" | "po2" | "so2" | "hco3" | "baseExcess";

/**
 * Blood-gas panel and member codes per specimen.
 *
 * Panels (FHIR value set diagnostic-requests lists them in LOINC's order):
 * 24336-0 "Gas panel - Arterial blood", 24337-8 "Gas panel - Capillary blood",
 * 24338-6 "Gas panel - Blood" (unspecified specimen; display: recollection),
 * 24339-4 "Gas panel - Venous blood". A venous gas is sent as 24339-4, not as
 * 24338-6, which would not say the blood was venous.
 *
 * Arterial members: 2744-1 "pH of Arterial blood" (German Corona Consensus
 * data set IG, example pH-arterial); 2019-8 "Carbon dioxide [Partial pressure]
 * in Arterial blood" and 2703-7 "Oxygen [Partial pressure] in Arterial blood"
 * (MCC eCare Plan IG, arterial-blood-gas-panel example); 2708-6 (see
 * LOINC.oxygenSaturationArterial); 1960-4 "Bicarbonate [Moles/volume] in
 * Arterial blood" (display: recollection); 1925-7 "Base excess in Arterial
 * blood by calculation" (display: recollection; DICOM CID 3527 lists 1925-7 as
 * arterial blood base excess).
 *
 * Venous members (recollection; not checked here): 2746-6, 2021-4, 2705-2,
 * 2711-0, 14627-4, 1927-3 (DICOM CID 3527 lists 1927-3 as venous blood base
 * excess).
 */
export const BLOOD_GAS_LOINC: Record<
  "arterial" | "venous",
  { panel: Code } & Record<BloodGasMember, Code>
> = {
  arterial: {
    panel: { code: "24336-0", display: "Gas panel - Arterial blood" },
    ph: { code: "2744-1", display: "pH of Arterial blood" },
    pco2: { code: "2019-8", display: "Carbon dioxide [Partial pressure] in Arterial blood" },
    po2: { code: "2703-7", display: "Oxygen [Partial pressure] in Arterial blood" },
    so2: { code: "2708-6", display: "Oxygen saturation in Arterial blood" },
    hco3: { code: "1960-4", display: "Bicarbonate [Moles/volume] in Arterial blood" },
    baseExcess: { code: "1925-7", display: "Base excess in Arterial blood by calculation" },
  },
  venous: {
    panel: { code: "24339-4", display: "Gas panel - Venous blood" },
    ph: { code: "2746-6", display: "pH of Venous blood" },
    pco2: { code: "2021-4", display: "Carbon dioxide [Partial pressure] in Venous blood" },
    po2: { code: "2705-2", display: "Oxygen [Partial pressure] in Venous blood" },
    so2: { code: "2711-0", display: "Oxygen saturation in Venous blood" },
    hco3: { code: "14627-4", display: "Bicarbonate [Moles/volume] in Venous blood" },
    baseExcess: { code: "1927-3", display: "Base excess in Venous blood by calculation" },
  },
};

/**
 * SNOMED CT concept for the order's procedure. Recalled, to be checked
 * against the SNOMED CT browser. Every Tidemark order prescribes an oxygen
 * target and FiO2 limits, ventilator orders included, so one concept serves;
 * the device goes in orderDetail.
 */
export const SNOMED_OXYGEN_THERAPY: Code = { code: "57485005", display: "Oxygen therapy" };

/** UCUM unit codes with the human-readable unit shown beside them. */
export const UCUM = {
  percent: { code: "%", unit: "%" },
  perMinute: { code: "/min", unit: "/min" },
  litresPerMinute: { code: "L/min", unit: "L/min" },
  cmH2O: { code: "cm[H2O]", unit: "cmH2O" },
  mmHg: { code: "mm[Hg]", unit: "mmHg" },
  mmolPerLitre: { code: "mmol/L", unit: "mmol/L" },
  gramsPerDecilitre: { code: "g/dL", unit: "g/dL" },
  pH: { code: "[pH]", unit: "pH" },
} as const satisfies Record<string, { code: string; unit: string }>;

export type UcumUnit = (typeof UCUM)[keyof typeof UCUM];

/** Observation categories (FHIR R4 observation-category code system). */
export const CATEGORY = {
  vitalSigns: { code: "vital-signs", display: "Vital Signs" },
  laboratory: { code: "laboratory", display: "Laboratory" },
  therapy: { code: "therapy", display: "Therapy" },
} as const satisfies Record<string, Code>;

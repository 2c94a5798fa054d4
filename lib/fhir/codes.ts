/**
 * The code systems, codes and units the FHIR R4 export uses, in one place.
 *
 * LOINC and SNOMED CT codes below were written from memory, not copied from a
 * terminology release; each is marked "recalled, to be checked against
 * loinc.org" (or the SNOMED CT browser) until someone with access to the
 * release has confirmed it. UCUM unit codes are checked by the tests with the
 * NLM's UCUM implementation (@lhncbc/ucum-lhc).
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
 * LOINC codes. All recalled, to be checked against loinc.org.
 * Blood-gas members differ by specimen: arterial and venous samples have
 * their own codes, so a venous PO2 is never sent as an arterial one.
 */
export const LOINC = {
  /** Recalled, to be checked against loinc.org. */
  spo2: { code: "59408-5", display: "Oxygen saturation in Arterial blood by Pulse oximetry" },
  /**
   * The generic code the R4 vital-signs profile for oxygen saturation names;
   * sent beside 59408-5 on SpO2. Recalled, to be checked against loinc.org.
   */
  oxygenSaturationArterial: { code: "2708-6", display: "Oxygen saturation in Arterial blood" },
  /** Recalled, to be checked against loinc.org. */
  respiratoryRate: { code: "9279-1", display: "Respiratory rate" },
  /** Recalled, to be checked against loinc.org. */
  pulseRate: { code: "8867-4", display: "Heart rate" },
  /** Recalled, to be checked against loinc.org. LOINC's example unit is %. */
  inhaledOxygenConcentration: { code: "3150-0", display: "Inhaled oxygen concentration" },
  /** Recalled, to be checked against loinc.org. */
  inhaledOxygenFlowRate: { code: "3151-8", display: "Inhaled oxygen flow rate" },
  /**
   * Recalled, to be checked against loinc.org (76248-4 was the other candidate;
   * 20077-4 is the one recalled as the ventilator's PEEP setting).
   */
  peepSetting: { code: "20077-4", display: "Positive end expiratory pressure setting Ventilator" },
  /** Recalled, to be checked against loinc.org. */
  hemoglobin: { code: "718-7", display: "Hemoglobin [Mass/volume] in Blood" },
} as const satisfies Record<string, Code>;

export type BloodGasMember = "ph" | "pco2" | "po2" | "so2" | "hco3" | "baseExcess";

/** Blood-gas panel and member codes per specimen. All recalled, to be checked against loinc.org. */
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
    panel: { code: "24338-6", display: "Gas panel - Venous blood" },
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

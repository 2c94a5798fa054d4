import { OxygenInputError } from "./errors";
import { OXIMETER_ACCURATE_FROM_PCT } from "./oximetry";

/** An accepted input range, inclusive at both ends. */
export interface InputRange {
  readonly min: number;
  readonly max: number;
  readonly unit: string;
}

/** A row of the range table: the range, the quantity's name in messages, and why. */
export interface ClinicalRange extends InputRange {
  readonly label: string;
  /** Why the bounds are what they are; "common practice" where no single source sets them. */
  readonly why: string;
}

const row = (label: string, min: number, max: number, unit: string, why: string) =>
  ({ label, min, max, unit, why }) as const satisfies ClinicalRange;

/**
 * The one range table: every quantity Tidemark accepts, with its unit and the
 * reason for its bounds (`why`). The engine checks its inputs against it (refusing with
 * an OxygenInputError that names the field and the range), the shared zod
 * schemas (lib/<noun>/schema.ts, lib/oxygenation/schema.ts) state it in their
 * messages, and the file imports (lib/imports) check each row against it. The
 * bounds catch typing and unit errors (kPa typed as mmHg, FiO2 typed as a
 * percentage); they do not judge the patient — adult critical care, sea level
 * to high altitude, no hyperbaric oxygen.
 */
export const RANGES = {
  // Saturations, in % where a person types them.
  spo2: row(
    "SpO2",
    0,
    100,
    "%",
    "Anything a pulse oximeter displays: the deepest desaturations are charted and alerted, never refused; under 70 % they are marked below oximeter accuracy (./oximetry).",
  ),
  spo2Index: row(
    "SpO2",
    40,
    100,
    "%",
    "S/F, OSI, ROX, the P/F imputed from S/F and the global ARDS definition's S/F arm use SpO2 from 40 %: far below any oximeter's stated accuracy the indices mean nothing (Tidemark's floor, not a published one).",
  ),
  spo2Target: row(
    "SpO2 target",
    OXIMETER_ACCURATE_FROM_PCT,
    100,
    "%",
    "An order's SpO2 band lies where oximeters state their accuracy (70–100 %, ./oximetry); the orders table holds the same bounds.",
  ),
  sao2: row(
    "SaO2",
    40,
    100,
    "%",
    "Arterial saturation keeps a physiological floor: an 'arterial' sample under 40 % is far more often venous or mislabelled (common practice).",
  ),
  svo2: row(
    "SvO2/ScvO2",
    20,
    100,
    "%",
    "Mixed or central venous saturation is normally 60–80 % and falls far lower in shock (common practice).",
  ),
  saturationFraction: row(
    "Saturation",
    0,
    1,
    "fraction",
    "Any saturation as an oxygen content input, arterial or venous: 0 and 1 are meaningful there.",
  ),
  saturation: row(
    "Saturation",
    0.001,
    0.9999,
    "fraction",
    "The inverse dissociation curve's domain: 0 and 1 map to PO2 0 and infinity.",
  ),

  // Settings.
  fio2: row(
    "FiO2",
    0.21,
    1,
    "fraction",
    "Room air to pure oxygen: hypoxic gas mixtures are not prescribed on the wards Tidemark serves.",
  ),
  peep: row(
    "PEEP",
    0,
    30,
    "cmH2O",
    "No PEEP to above the highest step of the ARDS Network tables (24 cmH2O); more is not set on adult wards (common practice).",
  ),
  flow: row(
    "Flow",
    0.5,
    70,
    "L/min",
    "The lowest nasal cannula flow to the highest high-flow setting the device profiles know (lib/devices); the engine's earlier 0–80 gave way to the orders' 0.5–70.",
  ),

  // Blood gas.
  pao2: row(
    "PaO2",
    10,
    700,
    "mmHg",
    "Under 10 mmHg is not a live arterial sample; above 700 mmHg needs hyperbaric oxygen (PAO2 at FiO2 1 and 800 mmHg is about 745 mmHg).",
  ),
  pfRatio: row(
    "P/F ratio",
    10,
    3334,
    "mmHg",
    "An accepted PaO2 (10–700 mmHg) over an accepted FiO2 (0.21–1) lies between 10 and 3333 mmHg; outside, PaO2 and FiO2 were typed in the wrong units.",
  ),
  pao2Target: row(
    "PaO2 target",
    40,
    300,
    "mmHg",
    "An order's PaO2 band: from severe hypoxaemia to well above any oxygenation target in use (common practice).",
  ),
  paco2: row(
    "PaCO2",
    10,
    150,
    "mmHg",
    "Hyperventilation to extreme permissive hypercapnia; outside, a unit error is far likelier (common practice).",
  ),
  ph: row(
    "pH",
    6.5,
    8,
    "",
    "Beyond 6.5–8.0 a blood pH is not compatible with life: a typing or analyser error (common practice).",
  ),
  hco3: row(
    "HCO3",
    2,
    60,
    "mmol/L",
    "Extreme metabolic acidosis to extreme alkalosis (common practice).",
  ),
  baseExcess: row(
    "Base excess",
    -30,
    30,
    "mmol/L",
    "Extreme metabolic acidosis to extreme alkalosis (common practice).",
  ),
  hemoglobin: row(
    "Haemoglobin",
    3,
    25,
    "g/dL",
    "Profound anaemia to extreme polycythaemia; g/L typed as g/dL falls outside (common practice).",
  ),

  // Observations.
  respiratoryRate: row(
    "Respiratory rate",
    2,
    80,
    "/min",
    "Agonal breathing to the fastest adult tachypnoea (common practice).",
  ),
  pulseRate: row(
    "Pulse rate",
    20,
    250,
    "/min",
    "Profound bradycardia to the fastest adult tachyarrhythmias (common practice).",
  ),

  // The gas equations.
  po2: row(
    "PO2",
    1,
    800,
    "mmHg",
    "Any blood or gas PO2 the dissociation curve is asked about, up to the highest barometric pressure accepted.",
  ),
  barometricPressure: row(
    "Barometric pressure",
    150,
    800,
    "mmHg",
    "150 mmHg is the ICAO pressure near the tropopause; 800 mmHg a deep below-sea-level site in high pressure weather. Hyperbaric is excluded.",
  ),
  waterVapourPressure: row(
    "Water vapour pressure",
    0,
    60,
    "mmHg",
    "47 mmHg at 37 °C; about 55 mmHg at 40 °C.",
  ),
  respiratoryQuotient: row(
    "Respiratory quotient",
    0.6,
    1.3,
    "ratio",
    "Fat oxidation (0.7) to net lipogenesis (above 1), with a margin (physiology texts; common practice).",
  ),
  altitude: row(
    "Altitude",
    -500,
    11000,
    "m",
    "The ICAO formula holds in the troposphere (up to 11,000 m).",
  ),
  gasFraction: row("Gas fraction", 0, 1, "fraction", "A fraction of a gas mixture."),

  // Ventilation and circulation.
  meanAirwayPressure: row(
    "Mean airway pressure",
    1,
    60,
    "cmH2O",
    "Spontaneous breathing to high-frequency oscillation (common practice).",
  ),
  plateauPressure: row(
    "Plateau pressure",
    1,
    60,
    "cmH2O",
    "Also at least PEEP + 1 cmH2O: a smaller driving pressure with a real tidal volume would mean a compliance no lung has.",
  ),
  peakPressure: row(
    "Peak pressure",
    1,
    80,
    "cmH2O",
    "Also at least the plateau pressure; the upper bound is common practice.",
  ),
  tidalVolumeMl: row(
    "Tidal volume",
    50,
    2000,
    "mL",
    "Adult tidal volumes, from small to the largest (common practice).",
  ),
  heightCm: row(
    "Height",
    130,
    230,
    "cm",
    "The ARDS Network PBW equation is for adults; at 102 cm it reaches 0 kg.",
  ),
  predictedBodyWeight: row(
    "Predicted body weight",
    25,
    121,
    "kg",
    "What the ARDS Network equation gives over the accepted heights: 25.1 kg (female, 130 cm) to 120.6 kg (male, 230 cm).",
  ),
  tidalVolumeTarget: row(
    "Tidal volume target",
    4,
    10,
    "mL/kg PBW",
    "An order's tidal volume per kg of predicted body weight: the ARDS Network allowed 4–8 mL/kg around a 6 mL/kg goal (NEJM 2000;342:1301); up to 10 covers lungs without ARDS (common practice).",
  ),
  ventilatorRate: row(
    "Rate",
    4,
    40,
    "/min",
    "An order's rate range: the ARDS Network set rates up to 35 /min (NEJM 2000;342:1301); 4–40 leaves room either side (common practice).",
  ),
  plateauLimit: row(
    "Plateau pressure limit",
    20,
    40,
    "cmH2O",
    "The ARDS Network kept plateau pressure at or under 30 cmH2O (NEJM 2000;342:1301); a limit from 20 to 40 covers stiffer chest walls and stricter units (common practice).",
  ),
  drivingLimit: row(
    "Driving pressure limit",
    8,
    25,
    "cmH2O",
    "15 cmH2O is the usual limit (common practice; Amato et al. NEJM 2015;372:747 found risk rising above it); 8–25 covers stricter and looser unit rules.",
  ),
  minuteVentilation: row(
    "Minute ventilation",
    0.5,
    50,
    "L/min",
    "The least a ventilated adult breathes to more than any adult ventilator setting; outside, mL/min was typed as L/min (common practice).",
  ),
  cardiacOutput: row(
    "Cardiac output",
    0.5,
    20,
    "L/min",
    "Low-output shock to a high-output state (common practice).",
  ),
  oxygenContent: row(
    "Oxygen content",
    0,
    40,
    "mL/dL",
    "Above what 25 g/dL of haemoglobin carries fully saturated at PO2 700 mmHg (about 36 mL/dL).",
  ),
  ageYears: row("Age", 18, 120, "years", "The age/4 + 4 rule of thumb is an adult rule."),

  // Oxygen cylinders (gauge pressure).
  cylinderPressure: row(
    "Cylinder pressure",
    0,
    300,
    "bar",
    "Empty to the highest filling pressure of medical oxygen cylinders in use (300 bar; US steel cylinders about 2000–2200 psi, 138–152 bar) (common practice). Stated in the caller's unit (psi, bar or kPa) when refused.",
  ),
  cylinderWaterCapacity: row(
    "Cylinder water capacity",
    0.5,
    50,
    "L",
    "The smallest portable cylinder to the largest bank cylinder (common practice: 1 to 50 L water capacity).",
  ),

  // Unit conversions accept anything physical, not only physiological values.
  pressureMmHg: row(
    "Pressure",
    0,
    1000,
    "mmHg",
    "Any pressure a conversion is asked for; the physiological range is checked where the value is used.",
  ),
  hemoglobinGramsPerDecilitre: row(
    "Haemoglobin",
    0,
    30,
    "g/dL",
    "Any haemoglobin a conversion is asked for; above 30 g/dL the value is g/L typed as g/dL.",
  ),
} as const satisfies Record<string, ClinicalRange>;

export type RangeKey = keyof typeof RANGES;

/**
 * The lowest alveolar PO2 the alveolar gas equation may return. Below it the
 * inputs contradict each other (e.g. PaCO2 150 mmHg on room air at altitude):
 * the equation would give a negative PAO2.
 */
export const MIN_ALVEOLAR_PO2 = 1;

/** " mmHg" after a value, or nothing for fractions and unitless values such as pH. */
export function unitSuffix(unit: string): string {
  return unit === "" || unit === "fraction" ? "" : ` ${unit}`;
}

// Fractions as the product writes FiO2 (0.21–1.00); everything else as it is.
const bound = (value: number, unit: string) =>
  unit === "fraction" ? value.toFixed(2) : String(value);

/** "between 10 and 700 mmHg": a range in the words the schemas' messages use. */
export function betweenWords(range: InputRange): string {
  return `between ${bound(range.min, range.unit)} and ${bound(range.max, range.unit)}${unitSuffix(range.unit)}`;
}

/** "PaO2 must be between 10 and 700 mmHg." — the refusal naming the field and its range. */
export function rangeRefusal(label: string, range: InputRange): string {
  return `${label} must be ${betweenWords(range)}.`;
}

/** Returns `value` if it is finite and inside `[min, max]`, else throws. */
export function checkBetween(
  field: string,
  value: number,
  min: number,
  max: number,
  unit: string,
  reason?: string,
): number {
  if (!Number.isFinite(value) || value < min || value > max) {
    throw new OxygenInputError({ field, value, min, max, unit, reason });
  }
  return value;
}

/** Returns `value` if it is finite and inside `range`, else throws. */
export function checkRange(field: string, value: number, range: InputRange): number {
  return checkBetween(field, value, range.min, range.max, range.unit);
}

import { severinghausSaturation } from "./dissociation";
import { checkRange, RANGES } from "./ranges";

/** mL O2 carried per g of fully saturated haemoglobin (clinical Hüfner factor; 1.39 in theory). */
export const HEMOGLOBIN_OXYGEN_CAPACITY = 1.34;
/** mL O2 dissolved per dL of blood per mmHg of PO2 at 37 °C. */
export const OXYGEN_SOLUBILITY = 0.003;

export interface OxygenContentInput {
  /** g/dL */
  hemoglobin: number;
  /** fraction 0–1 */
  saturation: number;
  /** mmHg */
  po2: number;
}

export interface OxygenContentParts {
  /** mL O2/dL carried by haemoglobin */
  bound: number;
  /** mL O2/dL dissolved in plasma */
  dissolved: number;
  /** mL O2/dL */
  total: number;
}

/** Content without input checks, for the engine's own solvers; saturation from Severinghaus. */
export function contentAtPO2(hemoglobin: number, po2: number): number {
  return (
    HEMOGLOBIN_OXYGEN_CAPACITY * hemoglobin * severinghausSaturation(po2) + OXYGEN_SOLUBILITY * po2
  );
}

/** Dissolved oxygen in mL O2/dL at a PO2 in mmHg (Henry's law, 0.003 mL/dL/mmHg). */
export function dissolvedOxygen(po2: number): number {
  checkRange("po2", po2, RANGES.po2);
  return OXYGEN_SOLUBILITY * po2;
}

/**
 * Oxygen content split into its bound and dissolved parts:
 * CaO2 = 1.34·Hb·SO2 + 0.003·PO2 (see SOURCES.oxygenContent).
 */
export function oxygenContentParts({
  hemoglobin,
  saturation,
  po2,
}: OxygenContentInput): OxygenContentParts {
  checkRange("hemoglobin", hemoglobin, RANGES.hemoglobin);
  checkRange("saturation", saturation, RANGES.saturationFraction);
  const dissolved = dissolvedOxygen(po2);
  const bound = HEMOGLOBIN_OXYGEN_CAPACITY * hemoglobin * saturation;
  return { bound, dissolved, total: bound + dissolved };
}

/** Oxygen content in mL O2/dL: 1.34·Hb·SO2 + 0.003·PO2. */
export function oxygenContent(input: OxygenContentInput): number {
  return oxygenContentParts(input).total;
}

/** Oxygen delivery in mL O2/min: DO2 = 10·CO (L/min)·CaO2 (mL/dL); 10 dL per litre. */
export function oxygenDelivery({
  cardiacOutput,
  arterialContent,
}: {
  /** L/min */
  cardiacOutput: number;
  /** CaO2, mL O2/dL */
  arterialContent: number;
}): number {
  checkRange("cardiacOutput", cardiacOutput, RANGES.cardiacOutput);
  checkRange("arterialContent", arterialContent, RANGES.oxygenContent);
  return 10 * cardiacOutput * arterialContent;
}

import type * as fhir4 from "fhir/r4";
import { DEVICE_PROFILES, type Device } from "../devices";
import { type Code, FHIR_SYSTEMS, type UcumUnit } from "./codes";

// FHIR datatypes (Quantity, CodeableConcept, Reference) and value texts shared
// by the resource mappings: pure, no framework, database or I/O imports.

/**
 * FiO2 is stored as a fraction; the export sends it in %, as the HL7 SANER IG's
 * 19994-3 example Observations do ("value: 100 %"); 3150-0 in %: recollection.
 */
export function fio2Percent(fio2: number): number {
  return Math.round(fio2 * 1000) / 10;
}

export const fio2Text = (fio2: number) => fio2.toFixed(2);
export const deviceLabel = (device: Device) => DEVICE_PROFILES[device].label;

export function quantity(value: number, unit: UcumUnit): fhir4.Quantity {
  return { value, unit: unit.unit, system: FHIR_SYSTEMS.ucum, code: unit.code };
}

export function loincConcept(...codes: Code[]): fhir4.CodeableConcept {
  return {
    coding: codes.map((c) => ({ system: FHIR_SYSTEMS.loinc, code: c.code, display: c.display })),
    text: codes[0]?.display ?? "",
  };
}

export function category(c: Code): fhir4.CodeableConcept[] {
  return [
    { coding: [{ system: FHIR_SYSTEMS.observationCategory, code: c.code, display: c.display }] },
  ];
}

export const person = (name: string | null): fhir4.Reference[] | undefined =>
  name === null ? undefined : [{ display: name }];

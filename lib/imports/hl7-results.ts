import type { BloodGasMeasuredColumn, MeasuredField, RowReason } from "./kinds";
import { MEASURED_FIELDS } from "./kinds";
import type { Hl7Observation, Hl7Result } from "./hl7";
import type { BloodGasCandidate, RawValue, ReadingCandidate } from "./rows";

/**
 * The LOINC codes Tidemark reads from OBX-3, each with the LOINC term name and
 * where a published FHIR profile or value set uses it (the export's sources in
 * lib/fhir/codes.ts name the same texts):
 * - 2744-1 "pH of Arterial blood" (German Corona Consensus data set IG);
 * - 2019-8 "Carbon dioxide [Partial pressure] in Arterial blood" and 2703-7
 *   "Oxygen [Partial pressure] in Arterial blood" (MCC eCare Plan IG,
 *   arterial-blood-gas-panel example);
 * - 2708-6 "Oxygen saturation in Arterial blood": the code the FHIR R4 Oxygen
 *   Saturation profile fixes for SpO2, and US Core Pulse Oximetry's "O2Sat"
 *   slice beside 59408-5. So a sender may code a pulse-oximetry SpO2 as
 *   2708-6; see hl7Candidates for when it is read as SaO2 and when as SpO2;
 * - 1960-4 "Bicarbonate [Moles/volume] in Arterial blood" and 1925-7 "Base
 *   excess in Arterial blood by calculation" (term names: recollection);
 * - 718-7 "Hemoglobin [Mass/volume] in Blood" (HL7 Switzerland CH LAB-Order
 *   IG) and 30313-1 "Hemoglobin [Mass/volume] in Arterial blood" (term name:
 *   recollection);
 * - FiO2 as 3150-0 "Inhaled oxygen concentration", 19994-3 "Oxygen/Inspired
 *   gas setting [Volume Fraction] Ventilator" (HL7 SANER IG, value set
 *   VentilatorObservations) or 19996-8 "Oxygen/Inspired gas Respiratory system
 *   --on ventilator" (term name: recollection);
 * - 59408-5 "Oxygen saturation in Arterial blood by Pulse oximetry" (US Core
 *   Pulse Oximetry's "PulseOx" slice): SpO2.
 */
export const LOINC_FIELDS: Record<string, MeasuredField> = {
  "2744-1": "ph",
  "2019-8": "paco2",
  "2703-7": "pao2",
  "2708-6": "sao2",
  "1960-4": "hco3",
  "1925-7": "baseExcess",
  "718-7": "hemoglobin",
  "30313-1": "hemoglobin",
  "3150-0": "fio2",
  "19994-3": "fio2",
  "19996-8": "fio2",
  "59408-5": "spo2",
};

/** Values measured on a blood sample: an OBR with any of them is a blood gas. */
const BLOOD_FIELDS = new Set<MeasuredField>([
  "ph",
  "paco2",
  "pao2",
  "hco3",
  "baseExcess",
  "hemoglobin",
]);
/** Final and corrected results are imported; preliminary and cancelled ones are not. */
const IMPORTED_STATUSES = new Set(["F", "C"]);

export type Hl7Candidates = {
  bloodGases: BloodGasCandidate[];
  readings: ReadingCandidate[];
  /** Observations Tidemark does not use, listed so nothing is dropped silently. */
  ignored: string[];
};

const obxLabel = (o: Hl7Observation, field?: MeasuredField) =>
  `OBX ${o.setId || "?"} (segment ${o.segmentIndex}${field ? `, ${MEASURED_FIELDS[field].label}` : ""})`;

/**
 * Groups an ORU^R01's results into rows. An OBR with a value measured on blood
 * (PaO2, PaCO2, pH, HCO3, base excess, Hb) is one blood gas, with the FiO2 and
 * the 2708-6 saturation of the same OBR as its FiO2 and SaO2. Each SpO2
 * (59408-5) is one reading. A 2708-6 in an OBR without any blood value is a
 * pulse-oximetry saturation coded as the FHIR vital-signs profiles code SpO2,
 * so it is one reading too, not a blood gas without a PaO2. When such an OBR
 * also sends the same value at the same time as 59408-5, it is one reading.
 */
export function hl7Candidates(message: Hl7Result): Hl7Candidates {
  const bloodGases: BloodGasCandidate[] = [];
  const readings: ReadingCandidate[] = [];
  const ignored: string[] = [];
  for (const group of message.groups) {
    const values: Partial<Record<BloodGasMeasuredColumn, RawValue>> = {};
    const reasons: RowReason[] = [];
    const used: [Hl7Observation, MeasuredField][] = [];
    for (const o of group.observations) {
      const field = o.codeSystem === "LN" || o.codeSystem === "" ? LOINC_FIELDS[o.code] : undefined;
      if (!field) {
        ignored.push(
          `OBR ${group.obrNumber} ${obxLabel(o)}: ${o.code}${o.codeSystem ? `^${o.codeSystem}` : ""} ${o.codeText} is not used by Tidemark.`,
        );
        continue;
      }
      used.push([o, field]);
    }
    const hasGas = used.some(([, field]) => BLOOD_FIELDS.has(field));
    const spo2Obx: Hl7Observation[] = [];
    for (const [o, field] of used) {
      const asReading = field === "spo2" || (field === "sao2" && !hasGas);
      const statusReason: RowReason | undefined = IMPORTED_STATUSES.has(o.status)
        ? undefined
        : {
            code: "status",
            field: asReading ? "spo2" : field,
            message: `${obxLabel(o, asReading ? "spo2" : field)} has result status '${o.status}'; only final (F) or corrected (C) results are imported.`,
          };
      if (asReading) {
        const takenAt = o.observedAt || group.observedAt;
        const same = spo2Obx.find(
          (s) =>
            s.code !== o.code &&
            s.value === o.value &&
            s.units === o.units &&
            (s.observedAt || group.observedAt) === takenAt &&
            s.status === o.status,
        );
        if (same) {
          ignored.push(
            `OBR ${group.obrNumber} ${obxLabel(o)}: ${o.code} repeats the SpO2 of OBX ${same.setId || "?"} (${same.code}) and is imported once.`,
          );
          continue;
        }
        spo2Obx.push(o);
        readings.push({
          line: o.segmentIndex,
          label: `OBR ${group.obrNumber} OBX ${o.setId || "?"}`,
          mrn: message.mrn,
          takenAt,
          spo2: { text: o.value, unit: o.units },
          pulseRate: undefined,
          reasons: statusReason ? [statusReason] : [],
        });
        continue;
      }
      if (statusReason) reasons.push(statusReason);
      const key = field as BloodGasMeasuredColumn;
      if (values[key]) {
        reasons.push({
          code: "duplicate",
          field,
          message: `${MEASURED_FIELDS[field].label} appears twice in OBR ${group.obrNumber}.`,
        });
      }
      values[key] = { text: o.value, unit: o.units };
    }
    if (hasGas) {
      bloodGases.push({
        line: group.segmentIndex,
        label: `OBR ${group.obrNumber}`,
        mrn: message.mrn,
        sampledAt:
          group.observedAt || group.observations.find((o) => o.observedAt)?.observedAt || "",
        sampleType: "arterial",
        values,
        reasons,
      });
    } else if (values.fio2) {
      ignored.push(`OBR ${group.obrNumber}: FiO2 without a blood gas is not imported on its own.`);
    }
  }
  return { bloodGases, readings, ignored };
}

import type { BloodGasMeasuredColumn, MeasuredField, RowReason } from "./kinds";
import { MEASURED_FIELDS } from "./kinds";
import type { Hl7Observation, Hl7Result } from "./hl7";
import type { BloodGasCandidate, RawValue, ReadingCandidate } from "./rows";

/**
 * The LOINC codes Tidemark reads from OBX-3. Recalled from memory, to be
 * checked against loinc.org before a site goes live:
 * 2744-1 pH of arterial blood; 2019-8 CO2 partial pressure, arterial;
 * 2703-7 O2 partial pressure, arterial; 2708-6 O2 saturation, arterial;
 * 1960-4 bicarbonate, arterial; 1925-7 base excess, arterial (calculated);
 * 718-7 haemoglobin, mass/volume in blood; 3150-0 inhaled oxygen concentration;
 * 59408-5 O2 saturation in arterial blood by pulse oximetry (SpO2).
 */
export const LOINC_FIELDS: Record<string, MeasuredField> = {
  "2744-1": "ph",
  "2019-8": "paco2",
  "2703-7": "pao2",
  "2708-6": "sao2",
  "1960-4": "hco3",
  "1925-7": "baseExcess",
  "718-7": "hemoglobin",
  "3150-0": "fio2",
  "59408-5": "spo2",
};

const GAS_FIELDS = new Set<MeasuredField>(["ph", "paco2", "pao2", "sao2", "hco3", "baseExcess", "hemoglobin"]);
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
 * Groups an ORU^R01's results into rows: each OBR with arterial blood gas
 * values is one blood gas; each SpO2 (59408-5) is one reading. FiO2 (3150-0)
 * in the same OBR goes with the gas.
 */
export function hl7Candidates(message: Hl7Result): Hl7Candidates {
  const bloodGases: BloodGasCandidate[] = [];
  const readings: ReadingCandidate[] = [];
  const ignored: string[] = [];
  for (const group of message.groups) {
    const values: Partial<Record<BloodGasMeasuredColumn, RawValue>> = {};
    const reasons: RowReason[] = [];
    let hasGas = false;
    for (const o of group.observations) {
      const field = o.codeSystem === "LN" || o.codeSystem === "" ? LOINC_FIELDS[o.code] : undefined;
      if (!field) {
        ignored.push(`OBR ${group.obrNumber} ${obxLabel(o)}: ${o.code}${o.codeSystem ? `^${o.codeSystem}` : ""} ${o.codeText} is not used by Tidemark.`);
        continue;
      }
      const statusReason: RowReason | undefined = IMPORTED_STATUSES.has(o.status)
        ? undefined
        : {
            code: "status",
            field,
            message: `${obxLabel(o, field)} has result status '${o.status}'; only final (F) or corrected (C) results are imported.`,
          };
      if (field === "spo2") {
        readings.push({
          line: o.segmentIndex,
          label: `OBR ${group.obrNumber} OBX ${o.setId || "?"}`,
          mrn: message.mrn,
          takenAt: o.observedAt || group.observedAt,
          spo2: { text: o.value, unit: o.units },
          pulseRate: undefined,
          reasons: statusReason ? [statusReason] : [],
        });
        continue;
      }
      if (GAS_FIELDS.has(field)) hasGas = true;
      if (statusReason) reasons.push(statusReason);
      const key = field as BloodGasMeasuredColumn;
      if (values[key]) {
        reasons.push({ code: "duplicate", field, message: `${MEASURED_FIELDS[field].label} appears twice in OBR ${group.obrNumber}.` });
      }
      values[key] = { text: o.value, unit: o.units };
    }
    if (hasGas) {
      bloodGases.push({
        line: group.segmentIndex,
        label: `OBR ${group.obrNumber}`,
        mrn: message.mrn,
        sampledAt: group.observedAt || group.observations.find((o) => o.observedAt)?.observedAt || "",
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

import type { LedgerAction } from "../ledger/vocabulary";

// What can be imported and with which units. Pure data, safe for the browser
// (the upload page builds its column-mapping step from it).

export const IMPORT_KINDS = ["blood_gas_csv", "hl7", "monitor_csv"] as const;
export type ImportKind = (typeof IMPORT_KINDS)[number];

export const IMPORT_KIND_LABELS: Record<ImportKind, string> = {
  blood_gas_csv: "Blood gas results (CSV)",
  hl7: "Blood gas results (HL7 v2 ORU^R01)",
  monitor_csv: "Monitor SpO2 series (CSV)",
};

export const IMPORT_LEDGER_ACTIONS: Record<ImportKind, LedgerAction> = {
  blood_gas_csv: "import.blood_gas_csv",
  hl7: "import.hl7",
  monitor_csv: "import.monitor_csv",
};

export const IMPORT_STATUSES = ["previewed", "imported"] as const;
export type ImportStatus = (typeof IMPORT_STATUSES)[number];

/** Units as UCUM codes, with the label a person reads. */
export const UNIT_LABELS = {
  "mm[Hg]": "mmHg",
  kPa: "kPa",
  "g/dL": "g/dL",
  "g/L": "g/L",
  "mmol/L": "mmol/L",
  "%": "%",
  "1": "fraction (0–1)",
  "[pH]": "pH",
} as const;
export type UcumCode = keyof typeof UNIT_LABELS;

/** Numeric blood gas values a file can carry, each with the units it may come in (first is stored). */
export const MEASURED_FIELDS = {
  ph: { label: "pH", units: ["[pH]"] },
  pao2: { label: "PaO2", units: ["mm[Hg]", "kPa"] },
  paco2: { label: "PaCO2", units: ["mm[Hg]", "kPa"] },
  hco3: { label: "HCO3", units: ["mmol/L"] },
  baseExcess: { label: "Base excess", units: ["mmol/L"] },
  sao2: { label: "SaO2", units: ["%", "1"] },
  hemoglobin: { label: "Haemoglobin", units: ["g/dL", "g/L", "mmol/L"] },
  fio2: { label: "FiO2", units: ["1", "%"] },
  spo2: { label: "SpO2", units: ["%", "1"] },
} as const satisfies Record<string, { label: string; units: readonly UcumCode[] }>;
export type MeasuredField = keyof typeof MEASURED_FIELDS;

/** The columns of a blood gas CSV that can be mapped, in the order the mapping step shows them. */
export const BLOOD_GAS_COLUMNS = [
  { key: "mrn", label: "MRN", required: true },
  { key: "sampledAt", label: "Time sampled", required: true },
  { key: "sampleType", label: "Sample type (arterial/venous)", required: false },
  { key: "pao2", label: "PaO2", required: true },
  { key: "paco2", label: "PaCO2", required: true },
  { key: "ph", label: "pH", required: false },
  { key: "hco3", label: "HCO3", required: false },
  { key: "baseExcess", label: "Base excess", required: false },
  { key: "sao2", label: "SaO2", required: false },
  { key: "hemoglobin", label: "Haemoglobin", required: false },
  { key: "fio2", label: "FiO2", required: false },
] as const;
export type BloodGasColumn = (typeof BLOOD_GAS_COLUMNS)[number]["key"];
export type BloodGasMeasuredColumn = Extract<BloodGasColumn, MeasuredField>;
export const BLOOD_GAS_MEASURED_COLUMNS = BLOOD_GAS_COLUMNS.map((c) => c.key).filter(
  (k): k is BloodGasMeasuredColumn => k in MEASURED_FIELDS,
);

export const CSV_DELIMITERS = { ",": "Comma (,)", ";": "Semicolon (;)", "\t": "Tab" } as const;
export type CsvDelimiter = keyof typeof CSV_DELIMITERS;

/**
 * The monitor file format: a header line `time,spo2` or `time,spo2,pulse_rate`
 * (comma-separated), one row per sample. The patient is named outside the file
 * (the upload form's MRN and bed, or the API's query parameters), so a monitor
 * export needs no editing.
 */
export const MONITOR_COLUMNS = ["time", "spo2", "pulse_rate"] as const;

/** Why a row was not imported; each reason names the field and the value or range. */
export type RejectCode =
  | "format"
  | "missing"
  | "unit"
  | "range"
  | "time"
  | "unknown_patient"
  | "duplicate"
  | "settings"
  | "status";

export type RowReason = { code: RejectCode; field?: string; message: string };

export type RejectedRow = {
  /** CSV line number (header is line 1) or the OBR/OBX position in an HL7 message. */
  line: number;
  /** How a person finds the row: "line 7", "OBR 2". */
  label: string;
  mrn: string | null;
  reasons: RowReason[];
};

export const REJECT_CODE_LABELS: Record<RejectCode, string> = {
  format: "format",
  missing: "missing field",
  unit: "unit",
  range: "out of range",
  time: "time",
  unknown_patient: "unknown patient",
  duplicate: "duplicate",
  settings: "bedside settings",
  status: "result status",
};

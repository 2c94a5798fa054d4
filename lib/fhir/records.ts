import type { Device } from "../devices";
import type { OrderView } from "../orders/queries";
import type { ReadingView } from "../readings/service";

// The rows one FHIR export maps: pure types, no framework, database or I/O imports.

/** The patient as the export names them. */
export type FhirPatientRow = {
  id: number;
  mrn: string;
  familyName: string;
  givenName: string;
  /** YYYY-MM-DD */
  birthDate: string;
  sex: "female" | "male";
};

export type FhirReadingRow = ReadingView & { recordedBy: string | null };

export type FhirBloodGasRow = {
  id: number;
  sampledAt: string;
  sampleType: "arterial" | "venous";
  ph: number | null;
  po2MmHg: number;
  pco2MmHg: number;
  hco3MmolL: number | null;
  baseExcessMmolL: number | null;
  so2Pct: number | null;
  hbGDl: number | null;
  device: Device;
  fio2: number;
  fio2Estimated: boolean;
  peepCmH2O: number | null;
  recordedBy: string;
};

export type FhirAdjustmentRow = {
  id: number;
  orderId: number;
  appliedAt: string;
  device: Device;
  fio2: number;
  peepCmH2O: number | null;
  flowLMin: number | null;
  reasonLabel: string;
  rationale: string;
  recordedBy: string;
};

/** Everything one export holds, oldest first within each kind. */
export type FhirPatientRecord = {
  patient: FhirPatientRow;
  orders: OrderView[];
  readings: FhirReadingRow[];
  bloodGases: FhirBloodGasRow[];
  adjustments: FhirAdjustmentRow[];
};

export type FhirExportOptions = {
  /** The installation's own address (NEXTAUTH_URL): part of every fullUrl's name. */
  installation: string;
  exportedAt: Date;
  /** Settings, readings and gases from this time on; orders are always all included. */
  since?: Date;
};

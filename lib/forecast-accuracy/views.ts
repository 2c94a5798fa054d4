import type { MeasureBasis } from "../reports/types";
import type { AccuracySummary, CalibrationPoint, Fio2StepBand } from "./summary";
import type { ForecastPair, PairingSettings, UncheckedAdjustment } from "./types";

// Shapes only and their plain converters, so a client component may import this file.

/** A pair as the API sends it: times as ISO 8601 (UTC). */
export type ForecastPairView = Omit<ForecastPair, "appliedAt" | "sampledAt"> & {
  appliedAt: string;
  sampledAt: string;
};

/** An unchecked change as the API sends it. */
export type UncheckedView = Omit<UncheckedAdjustment, "appliedAt" | "interruptedAt"> & {
  appliedAt: string;
  interruptedAt: string | null;
};

/** Where each row happened, in a unit's report. */
export type Where = { patientId: number; patient: string; bed: string };

/** The empirical interval's state for a patient: how many pairs, whether it applies, the rule. */
export type IntervalState = { pairs: number; minPairs: number; active: boolean; rule: string };

/** GET /api/v1/patients/[patientId]/forecast-accuracy: the patient's current (or last) admission. */
export type PatientForecastAccuracy = {
  patientId: number;
  admissionId: number;
  settings: PairingSettings;
  /** Newest first. */
  pairs: ForecastPairView[];
  /** Newest first. */
  unchecked: UncheckedView[];
  summary: AccuracySummary;
  interval: IntervalState;
  basis: MeasureBasis[];
};

/** GET /api/v1/reports/forecast-accuracy?unitId&from&to: changes recorded on the unit in [from, to). */
export type ForecastAccuracyReport = {
  unit: { id: number; code: string; name: string };
  period: { from: string; to: string };
  generatedAt: string;
  settings: PairingSettings;
  counts: {
    changes: number;
    checked: number;
    unchecked: number;
    byReason: { reason: UncheckedAdjustment["reason"]; label: string; count: number }[];
  };
  summary: AccuracySummary;
  byDevice: { device: string; summary: AccuracySummary }[];
  byFio2Step: { band: Fio2StepBand; label: string; summary: AccuracySummary }[];
  calibration: CalibrationPoint[];
  /** Oldest first. */
  pairs: (ForecastPairView & Where)[];
  /** Oldest first. */
  unchecked: (UncheckedView & Where)[];
  basis: MeasureBasis[];
};

export const pairView = (p: ForecastPair): ForecastPairView => ({
  ...p,
  appliedAt: p.appliedAt.toISOString(),
  sampledAt: p.sampledAt.toISOString(),
});

export const uncheckedView = (u: UncheckedAdjustment): UncheckedView => ({
  ...u,
  appliedAt: u.appliedAt.toISOString(),
  interruptedAt: u.interruptedAt ? u.interruptedAt.toISOString() : null,
});

/** A pair as the pure functions take it again (the client's interval, from the API's view). */
export const pairFromView = (p: ForecastPairView): ForecastPair => ({
  ...p,
  appliedAt: new Date(p.appliedAt),
  sampledAt: new Date(p.sampledAt),
});

/**
 * What the four reports answer (GET /api/v1/reports/…, the Reports page and
 * its CSV downloads share these shapes). Durations are in minutes, shares
 * in 0…1, times ISO 8601.
 */

export const REPORT_KINDS = ["time-in-band", "alerts", "oxygen-exposure", "orders"] as const;
export type ReportKind = (typeof REPORT_KINDS)[number];

export const REPORT_GROUPS = ["patient", "bed", "shift", "day"] as const;
export type ReportGroup = (typeof REPORT_GROUPS)[number];

export type ReportParams = { unitId: number; from: Date; to: Date; groupBy: ReportGroup };

/** How a measure is defined and where the definition comes from, shown in the basis view. */
export type MeasureBasis = { key: string; label: string; definition: string; source: string };

export type ReportPeriod = {
  unitId: number;
  unitCode: string;
  unitName: string;
  timeZone: string;
  from: string;
  to: string;
  groupBy: ReportGroup;
  generatedAt: string;
};

/** One row of a grouped table: a patient (with bed), a bed, a shift or a day. */
export type GroupKey = {
  key: string;
  label: string;
  /** Set for patient rows, so the table can link to the Chart. */
  patientId?: number;
  bedLabel?: string;
  /** Start of a shift or day row. */
  startsAt?: string;
};

export type TimeInBandMeasures = {
  /** Patient time on the unit in the group (the denominator). */
  patientMinutes: number;
  belowMinutes: number;
  inBandMinutes: number;
  aboveMinutes: number;
  unknownMinutes: number;
  /** Shares of patientMinutes. */
  below: number;
  inBand: number;
  above: number;
  unknown: number;
  below88Minutes: number;
  below85Minutes: number;
  /** Area below the band, %·min. */
  belowAreaPctMin: number;
  minSpo2: number | null;
  /** Arterial gases above the order's PaO2 band, of those with a band. */
  gasesAbovePao2Band: number;
  gasesWithPao2Band: number;
};

export type TimeInBandReport = {
  period: ReportPeriod;
  summary: TimeInBandMeasures;
  rows: (GroupKey & TimeInBandMeasures)[];
  basis: MeasureBasis[];
};

export type Distribution = { n: number; median: number | null; p90: number | null };

export type AlertMeasures = {
  alerts: number;
  patientDays: number;
  alertsPerPatientDay: number | null;
  /** Opened → acknowledged and → resolved, minutes. */
  toAcknowledge: Distribution;
  toResolve: Distribution;
  /** Share of alerts escalated at least once. */
  escalationRate: number | null;
  /** Excursion start → first adjustment, minutes. */
  excursionToAdjustment: Distribution;
};

export type AlertsReport = {
  period: ReportPeriod;
  summary: AlertMeasures;
  byKind: ({ kind: string; label: string } & AlertMeasures)[];
  rows: (GroupKey & AlertMeasures)[];
  basis: MeasureBasis[];
};

export type OxygenExposureMeasures = {
  patientDays: number;
  /** Hours on an FiO2 above room air. */
  oxygenHours: number;
  /** ∫ (FiO2 − 0.21) dt, FiO2-hours. */
  fio2HoursAboveRoomAir: number;
  /** Hours at FiO2 ≥ 0.6. */
  hoursAtFio2AtLeast60: number;
  /** Minutes above the band on supplemental oxygen. */
  aboveOnOxygenMinutes: number;
};

export type OxygenExposureReport = {
  period: ReportPeriod;
  summary: OxygenExposureMeasures;
  rows: (GroupKey & OxygenExposureMeasures)[];
  basis: MeasureBasis[];
};

export type OrderMeasures = {
  orders: number;
  verbalOrders: number;
  /** Verbal or telephone order entered → co-signed, minutes. */
  cosignDelay: Distribution;
  reassessments: number;
  reassessmentsOnTime: number | null;
  adjustments: number;
  adjustmentsPerPatientDay: number | null;
  /** Share of adjustments that applied the engine's proposal, of those made with one. */
  followedProposal: number | null;
  patientDays: number;
};

export type OrdersReport = {
  period: ReportPeriod;
  summary: OrderMeasures;
  rows: (GroupKey & OrderMeasures)[];
  basis: MeasureBasis[];
};

export type ReportOf<K extends ReportKind> = K extends "time-in-band"
  ? TimeInBandReport
  : K extends "alerts"
    ? AlertsReport
    : K extends "oxygen-exposure"
      ? OxygenExposureReport
      : OrdersReport;

import type {
  AlertMeasures,
  AlertsReport,
  Distribution,
  GroupKey,
  OrderMeasures,
  OxygenExposureMeasures,
  ReportGroup,
  ReportKind,
  ReportOf,
  TimeInBandMeasures,
} from "./types";

/**
 * What the Reports page shows of a report, as plain data: the summary tiles,
 * the tables (the page's and the CSV's columns are these, so they always
 * agree) and the series its charts draw. Pure, no framework.
 */

export type Cell = string | number | null;
export type ColumnFormat = "text" | "int" | "dec1" | "dec2" | "pct";
export type ReportColumn = { key: string; label: string; format: ColumnFormat };
export type ReportRow = { key: string; patientId?: number; cells: Cell[] };
export type ReportTable = { id: string; title: string; columns: ReportColumn[]; rows: ReportRow[] };

/** Clinical SpO2 state only (below / in / above the band) is coloured; everything else is neutral. */
export type Tone = "in-band" | "below" | "above" | "neutral" | "unknown";
export type Tile = { key: string; label: string; value: string; unit?: string; tone: Tone };
export type Series = { key: string; label: string; tone: Tone };
export type ChartSpec = {
  title: string;
  unit: string;
  stacked: boolean;
  series: Series[];
  points: { key: string; label: string; values: Record<string, number | null> }[];
};

export const round = (v: number, places: number) => {
  const f = 10 ** places;
  return Math.round(v * f) / f;
};
export const pct = (share: number | null) => (share === null ? null : round(share * 100, 1));
export const hours = (minutes: number) => round(minutes / 60, 1);

/** A cell as the page shows it ("–" for no value, a true minus sign; the unit is in the column's label). */
export function formatCell(value: Cell, format: ColumnFormat): string {
  if (value === null) return "–";
  if (typeof value === "string") return value;
  const text = formatNumberCell(value, format);
  // A value that rounds to zero is shown without a sign.
  return /[1-9]/.test(text) ? text.replace("-", "−") : text.replace("-", "");
}

function formatNumberCell(value: number, format: ColumnFormat): string {
  switch (format) {
    case "int":
      return Math.round(value).toLocaleString("en-GB");
    case "dec1":
    case "pct":
      return value.toLocaleString("en-GB", { minimumFractionDigits: 1, maximumFractionDigits: 1 });
    case "dec2":
      return value.toLocaleString("en-GB", { minimumFractionDigits: 2, maximumFractionDigits: 2 });
    case "text":
      return String(value);
  }
}

export const GROUP_LABELS: Record<ReportGroup, string> = {
  patient: "Patient",
  bed: "Bed",
  shift: "Shift",
  day: "Day",
};

export type Measures = {
  "time-in-band": TimeInBandMeasures;
  alerts: AlertMeasures;
  "oxygen-exposure": OxygenExposureMeasures;
  orders: OrderMeasures;
};
type Columns<M> = { key: string; label: string; format: ColumnFormat; value: (m: M) => Cell }[];

const med = (d: Distribution) => (d.median === null ? null : round(d.median, 1));
const p90 = (d: Distribution) => (d.p90 === null ? null : round(d.p90, 1));

const COLUMNS: { [K in ReportKind]: Columns<Measures[K]> } = {
  "time-in-band": [
    {
      key: "patientHours",
      label: "Patient time (h)",
      format: "dec1",
      value: (m) => hours(m.patientMinutes),
    },
    { key: "inBand", label: "In band (%)", format: "pct", value: (m) => pct(m.inBand) },
    { key: "below", label: "Below (%)", format: "pct", value: (m) => pct(m.below) },
    { key: "above", label: "Above on oxygen (%)", format: "pct", value: (m) => pct(m.above) },
    { key: "unknown", label: "No data (%)", format: "pct", value: (m) => pct(m.unknown) },
    { key: "below88", label: "SpO2 < 88 % (min)", format: "int", value: (m) => m.below88Minutes },
    { key: "below85", label: "SpO2 < 85 % (min)", format: "int", value: (m) => m.below85Minutes },
    {
      key: "belowArea",
      label: "Area below band (%·min)",
      format: "int",
      value: (m) => m.belowAreaPctMin,
    },
    { key: "minSpo2", label: "Lowest SpO2 (%)", format: "int", value: (m) => m.minSpo2 },
    {
      key: "gasesAbove",
      label: "Gases above PaO2 band",
      format: "text",
      value: (m) =>
        m.gasesWithPao2Band ? `${m.gasesAbovePao2Band} of ${m.gasesWithPao2Band}` : null,
    },
  ],
  alerts: [
    { key: "alerts", label: "Alerts", format: "int", value: (m) => m.alerts },
    {
      key: "perDay",
      label: "Per patient-day",
      format: "dec2",
      value: (m) => m.alertsPerPatientDay,
    },
    {
      key: "ackMedian",
      label: "To acknowledge, median (min)",
      format: "dec1",
      value: (m) => med(m.toAcknowledge),
    },
    {
      key: "ackP90",
      label: "To acknowledge, 90th pct (min)",
      format: "dec1",
      value: (m) => p90(m.toAcknowledge),
    },
    {
      key: "resolveMedian",
      label: "To resolve, median (min)",
      format: "dec1",
      value: (m) => med(m.toResolve),
    },
    {
      key: "escalated",
      label: "Escalated (%)",
      format: "pct",
      value: (m) => pct(m.escalationRate),
    },
    {
      key: "toAdjustment",
      label: "Excursion to adjustment, median (min)",
      format: "dec1",
      value: (m) => med(m.excursionToAdjustment),
    },
  ],
  "oxygen-exposure": [
    {
      key: "patientDays",
      label: "Patient-days",
      format: "dec1",
      value: (m) => round(m.patientDays, 1),
    },
    {
      key: "oxygenHours",
      label: "On oxygen (h)",
      format: "dec1",
      value: (m) => round(m.oxygenHours, 1),
    },
    {
      key: "fio2Hours",
      label: "FiO2-hours above room air",
      format: "dec1",
      value: (m) => round(m.fio2HoursAboveRoomAir, 1),
    },
    {
      key: "fio2At60",
      label: "FiO2 ≥ 0.6 (h)",
      format: "dec1",
      value: (m) => round(m.hoursAtFio2AtLeast60, 1),
    },
    {
      key: "aboveOnOxygen",
      label: "Above band on oxygen (min)",
      format: "int",
      value: (m) => m.aboveOnOxygenMinutes,
    },
  ],
  orders: [
    { key: "orders", label: "Orders", format: "int", value: (m) => m.orders },
    { key: "verbal", label: "Verbal or telephone", format: "int", value: (m) => m.verbalOrders },
    {
      key: "cosignMedian",
      label: "To co-sign, median (min)",
      format: "dec1",
      value: (m) => med(m.cosignDelay),
    },
    { key: "reassessments", label: "Reassessments", format: "int", value: (m) => m.reassessments },
    {
      key: "onTime",
      label: "Reassessed on time (%)",
      format: "pct",
      value: (m) => pct(m.reassessmentsOnTime),
    },
    { key: "adjustments", label: "Adjustments", format: "int", value: (m) => m.adjustments },
    {
      key: "adjPerDay",
      label: "Adjustments per patient-day",
      format: "dec2",
      value: (m) => m.adjustmentsPerPatientDay,
    },
    {
      key: "followed",
      label: "Followed the proposal (%)",
      format: "pct",
      value: (m) => pct(m.followedProposal),
    },
  ],
};

export type AnyRow = GroupKey & Record<string, unknown>;

function measureColumns<K extends ReportKind>(kind: K): Columns<Measures[K]> {
  return COLUMNS[kind] as Columns<Measures[K]>;
}

/** One grouped table of a report: rows per patient (with bed and a Chart link), bed, shift or day. */
export function groupTable<K extends ReportKind>(
  kind: K,
  report: ReportOf<K>,
  group: ReportGroup,
  title: string,
): ReportTable {
  const cols = measureColumns(kind);
  const head: ReportColumn[] = [{ key: "group", label: GROUP_LABELS[group], format: "text" }];
  if (group === "patient") head.push({ key: "bed", label: "Bed", format: "text" });
  const rows = report.rows as unknown as (AnyRow & Measures[K])[];
  return {
    id: `${kind}-${group}`,
    title,
    columns: [...head, ...cols.map(({ key, label, format }) => ({ key, label, format }))],
    rows: rows.map((r) => ({
      key: r.key,
      ...(r.patientId !== undefined ? { patientId: r.patientId } : {}),
      cells: [
        r.label,
        ...(group === "patient" ? [r.bedLabel ?? null] : []),
        ...cols.map((c) => c.value(r)),
      ],
    })),
  };
}

/** The alerts report's table by kind of alert. */
export function alertKindTable(report: AlertsReport): ReportTable {
  const cols = measureColumns("alerts");
  return {
    id: "alerts-kind",
    title: "Alerts by kind",
    columns: [
      { key: "kind", label: "Kind", format: "text" },
      ...cols.map(({ key, label, format }) => ({ key, label, format })),
    ],
    rows: report.byKind.map((k) => ({
      key: k.kind,
      cells: [k.label, ...cols.map((c) => c.value(k))],
    })),
  };
}

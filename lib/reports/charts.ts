import type { ReportKind, ReportOf } from "./types";
import {
  pct,
  round,
  type AnyRow,
  type ChartSpec,
  type ColumnFormat,
  type Measures,
  type ReportTable,
  type Tone,
} from "./tables";

type SeriesDef<M> = { key: string; label: string; tone: Tone; value: (m: M) => number | null };
const SERIES: {
  [K in ReportKind]: { unit: string; stacked: boolean; series: SeriesDef<Measures[K]>[] };
} = {
  "time-in-band": {
    unit: "% of patient time",
    stacked: true,
    series: [
      { key: "inBand", label: "In band", tone: "in-band", value: (m) => pct(m.inBand) },
      { key: "below", label: "Below", tone: "below", value: (m) => pct(m.below) },
      { key: "above", label: "Above on oxygen", tone: "above", value: (m) => pct(m.above) },
      { key: "unknown", label: "No data", tone: "unknown", value: (m) => pct(m.unknown) },
    ],
  },
  alerts: {
    unit: "alerts",
    stacked: false,
    series: [{ key: "alerts", label: "Alerts", tone: "neutral", value: (m) => m.alerts }],
  },
  "oxygen-exposure": {
    unit: "hours",
    stacked: false,
    series: [
      {
        key: "oxygenHours",
        label: "On oxygen (h)",
        tone: "neutral",
        value: (m) => round(m.oxygenHours, 1),
      },
      {
        key: "fio2At60",
        label: "FiO2 ≥ 0.6 (h)",
        tone: "unknown",
        value: (m) => round(m.hoursAtFio2AtLeast60, 1),
      },
    ],
  },
  orders: {
    unit: "count",
    stacked: false,
    series: [
      { key: "adjustments", label: "Adjustments", tone: "neutral", value: (m) => m.adjustments },
      { key: "orders", label: "Orders", tone: "unknown", value: (m) => m.orders },
    ],
  },
};

/** What a chart of a grouped report draws: one point per row, the kind's series. */
export function chartSpec<K extends ReportKind>(
  kind: K,
  report: ReportOf<K>,
  title: string,
): ChartSpec {
  const def = SERIES[kind] as unknown as {
    unit: string;
    stacked: boolean;
    series: SeriesDef<Measures[K]>[];
  };
  const rows = report.rows as unknown as (AnyRow & Measures[K])[];
  return {
    title,
    unit: def.unit,
    stacked: def.stacked,
    series: def.series.map(({ key, label, tone }) => ({ key, label, tone })),
    points: rows.map((r) => ({
      key: r.key,
      label: r.label,
      values: Object.fromEntries(def.series.map((s) => [s.key, s.value(r)])),
    })),
  };
}

/** A chart's data as a table: the text beside the chart, and its CSV. */
export function chartTable(spec: ChartSpec, id: string, firstColumn: string): ReportTable {
  return {
    id,
    title: spec.title,
    columns: [
      { key: "group", label: firstColumn, format: "text" },
      ...spec.series.map((s) => ({
        key: s.key,
        label: spec.unit.startsWith("%") ? `${s.label} (%)` : s.label,
        format: (spec.unit === "count" || spec.unit === "alerts" ? "int" : "dec1") as ColumnFormat,
      })),
    ],
    rows: spec.points.map((p) => ({
      key: p.key,
      cells: [p.label, ...spec.series.map((s) => p.values[s.key] ?? null)],
    })),
  };
}

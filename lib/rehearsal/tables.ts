import {
  formatCell,
  pct,
  round,
  type Cell,
  type ChartSpec,
  type ColumnFormat,
  type ReportColumn,
} from "../reports/tables";
import type { StayResult } from "./care";
import { CARE_MODEL_LABELS, CARE_MODEL_ORDER } from "./labels";
import type { ModelSummary } from "./run";
import type { RehearsalOutcome } from "./views";

/**
 * What the Rehearsal page shows of a finished run, as plain data: the tiles
 * per care model, the table beside the chart, the chart's series and the
 * per-patient table. The page's tables and their CSV use the same columns,
 * so they always agree. Pure, no framework.
 */

/** A table of the page and its CSV; a row may write a column its own way (the side by side). */
export type RehearsalColumn = ReportColumn & {
  /** Differences: "+2.0", "−1.5". */ signed?: boolean;
};
export type RehearsalRow = { key: string; cells: Cell[]; formats?: (ColumnFormat | undefined)[] };
export type RehearsalTable = {
  id: string;
  title: string;
  columns: RehearsalColumn[];
  rows: RehearsalRow[];
};

/** A cell as the page shows it: the row's format before the column's; "–" for no value. */
export function cellText(table: RehearsalTable, row: RehearsalRow, index: number): string {
  const column = table.columns[index]!;
  const value = row.cells[index] ?? null;
  const format = row.formats?.[index] ?? column.format;
  const text = formatCell(value, format);
  if (!column.signed || typeof value !== "number") return text;
  // formatCell writes a negative with a true minus and a value rounding to zero without a sign.
  return value > 0 && /[1-9]/.test(text) ? `+${text}` : text;
}

/** A measure of a care model: how it is labelled, written and compared. */
export type ModelMeasure = {
  key: keyof Omit<ModelSummary, "model">;
  /** The tile's and the side by side's words. */
  label: string;
  /** The column header (with its unit). */
  column: string;
  format: ColumnFormat;
  value: (m: ModelSummary) => number;
};

const perDay = (v: number, places: number) => round(v, places);

export const MODEL_MEASURES: readonly ModelMeasure[] = [
  {
    key: "medianInBand",
    label: "Time in band, median of patients",
    column: "In band, median (%)",
    format: "pct",
    value: (m) => pct(m.medianInBand)!,
  },
  {
    key: "inBand",
    label: "Time in band, pooled",
    column: "In band, pooled (%)",
    format: "pct",
    value: (m) => pct(m.inBand)!,
  },
  {
    key: "below",
    label: "Below the band",
    column: "Below (%)",
    format: "pct",
    value: (m) => pct(m.below)!,
  },
  {
    key: "above",
    label: "Above the band on oxygen",
    column: "Above on oxygen (%)",
    format: "pct",
    value: (m) => pct(m.above)!,
  },
  {
    key: "unknown",
    label: "Unknown (no monitor value)",
    column: "Unknown (%)",
    format: "pct",
    value: (m) => pct(m.unknown)!,
  },
  {
    key: "below88HoursPerDay",
    label: "SpO2 < 88 %, hours per patient-day",
    column: "SpO2 < 88 % (h/patient-day)",
    format: "dec2",
    value: (m) => perDay(m.below88HoursPerDay, 2),
  },
  {
    key: "below85HoursPerDay",
    label: "SpO2 < 85 %, hours per patient-day",
    column: "SpO2 < 85 % (h/patient-day)",
    format: "dec2",
    value: (m) => perDay(m.below85HoursPerDay, 2),
  },
  {
    key: "fio2HoursPerDay",
    label: "FiO2-hours above room air per patient-day",
    column: "FiO2-hours/patient-day",
    format: "dec2",
    value: (m) => perDay(m.fio2HoursPerDay, 2),
  },
  {
    key: "adjustmentsPerDay",
    label: "Adjustments per patient-day",
    column: "Adjustments/patient-day",
    format: "dec1",
    value: (m) => perDay(m.adjustmentsPerDay, 1),
  },
  {
    key: "alertsPerDay",
    label: "Nurses' alert burden: alerts per patient-day",
    column: "Alerts/patient-day",
    format: "dec1",
    value: (m) => perDay(m.alertsPerDay, 1),
  },
  {
    key: "escalationsPerDay",
    label: "Escalations per patient-day",
    column: "Escalations/patient-day",
    format: "dec2",
    value: (m) => perDay(m.escalationsPerDay, 2),
  },
];

/** The models of an outcome in the page's order (fixed-interval, Tidemark, reference). */
export function orderedModels(models: readonly ModelSummary[]): ModelSummary[] {
  return CARE_MODEL_ORDER.flatMap((key) => models.filter((m) => m.model === key));
}

/** One table row per care model, one column per measure: the text beside the chart. */
export function modelsTable(outcome: Pick<RehearsalOutcome, "models">): RehearsalTable {
  return {
    id: "models",
    title: "Care models",
    columns: [
      { key: "model", label: "Care model", format: "text" },
      ...MODEL_MEASURES.map((m) => ({ key: m.key, label: m.column, format: m.format })),
    ],
    rows: orderedModels(outcome.models).map((s) => ({
      key: s.model,
      cells: [CARE_MODEL_LABELS[s.model], ...MODEL_MEASURES.map((m) => m.value(s))],
    })),
  };
}

/** The stacked chart of where each care model's time went: below, in band, above, unknown. */
export function shareChart(outcome: Pick<RehearsalOutcome, "models">): ChartSpec {
  return {
    title: "Where the cohort's time went, by care model",
    unit: "% of patient time",
    stacked: true,
    series: [
      { key: "below", label: "Below", tone: "below" },
      { key: "inBand", label: "In band", tone: "in-band" },
      { key: "above", label: "Above on oxygen", tone: "above" },
      { key: "unknown", label: "Unknown", tone: "unknown" },
    ],
    points: orderedModels(outcome.models).map((s) => ({
      key: s.model,
      label: CARE_MODEL_LABELS[s.model],
      values: {
        below: pct(s.below),
        inBand: pct(s.inBand),
        above: pct(s.above),
        unknown: pct(s.unknown),
      },
    })),
  };
}

const share = (ms: number, period: number) => (period > 0 ? pct(ms / period) : null);
const minutes = (ms: number) => Math.round(ms / 60_000);

/** "Patient 1": the engine counts patients from 0, people from 1. */
export const patientLabel = (index: number) => `Patient ${index + 1}`;

/** Every patient under every care model: one row per stay. */
export function staysTable(outcome: Pick<RehearsalOutcome, "stays">): RehearsalTable {
  const order = (s: StayResult) => CARE_MODEL_ORDER.indexOf(s.model);
  const stays = [...outcome.stays].sort((a, b) => a.patient - b.patient || order(a) - order(b));
  return {
    id: "patients",
    title: "Per patient",
    columns: [
      { key: "patient", label: "Patient", format: "text" },
      { key: "model", label: "Care model", format: "text" },
      { key: "hours", label: "Stay (h)", format: "dec1" },
      { key: "inBand", label: "In band (%)", format: "pct" },
      { key: "below", label: "Below (%)", format: "pct" },
      { key: "above", label: "Above on oxygen (%)", format: "pct" },
      { key: "unknown", label: "Unknown (%)", format: "pct" },
      { key: "below88", label: "SpO2 < 88 % (min)", format: "int" },
      { key: "below85", label: "SpO2 < 85 % (min)", format: "int" },
      { key: "fio2Hours", label: "FiO2-hours", format: "dec2" },
      { key: "adjustments", label: "Adjustments", format: "int" },
      { key: "alerts", label: "Alerts", format: "int" },
      { key: "escalations", label: "Escalations", format: "int" },
    ],
    rows: stays.map((s) => ({
      key: `${s.patient}-${s.model}`,
      cells: [
        patientLabel(s.patient),
        CARE_MODEL_LABELS[s.model],
        round(s.periodMs / 3_600_000, 1),
        share(s.inBandMs, s.periodMs),
        share(s.belowMs, s.periodMs),
        share(s.aboveMs, s.periodMs),
        share(s.unknownMs, s.periodMs),
        minutes(s.below88Ms),
        minutes(s.below85Ms),
        round(s.fio2HoursAboveRoomAir, 2),
        s.adjustments,
        s.alerts,
        s.escalations,
      ],
    })),
  };
}

/** A care model's tile: its label and the measures as the page writes them. */
export type ModelTile = {
  model: ModelSummary["model"];
  label: string;
  values: { key: string; label: string; value: number; format: ColumnFormat; unit: string }[];
};

export function modelTiles(outcome: Pick<RehearsalOutcome, "models">): ModelTile[] {
  return orderedModels(outcome.models).map((s) => ({
    model: s.model,
    label: CARE_MODEL_LABELS[s.model],
    values: MODEL_MEASURES.map((m) => ({
      key: m.key,
      label: m.label,
      value: m.value(s),
      format: m.format,
      unit: m.format === "pct" ? "%" : "",
    })),
  }));
}

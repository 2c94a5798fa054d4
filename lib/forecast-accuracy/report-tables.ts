import type { PressureUnit } from "../oxygen/units";
import { unitClock } from "../reports/csv";
import { REPORT_LABELS } from "../reports/period";
import {
  formatCell,
  pct,
  type ColumnFormat,
  type ReportColumn,
  type ReportTable,
  type Tile,
} from "../reports/tables";
import type { ReportPeriod } from "../reports/types";
import { UNCHECKED_REASONS } from "./reasons";
import type { AccuracySummary, CalibrationPoint } from "./summary";
import { FORECAST_MODEL_LABELS, FORECAST_MODELS, type ForecastModel } from "./types";
import type { ForecastAccuracyReport } from "./views";
import {
  deviceLabel,
  fio2StepText,
  MODEL_SHORT,
  pressureDigits,
  pressureValue,
  rangeVerdict,
  VERDICT_WORDS,
} from "./words";

/**
 * What the Reports page shows of the forecast-accuracy report, as plain data:
 * its tiles, its tables (the page's and the CSV's columns are these, as for
 * the other reports) and the calibration plot's series. Pressures in the
 * reader's unit, rounded as shown; errors are forecast − measured. Pure.
 */

export const FORECAST_REPORT_LABEL = REPORT_LABELS["forecast-accuracy"];

const pressureFormat = (unit: PressureUnit): ColumnFormat => (unit === "kPa" ? "dec1" : "int");

/** The report's unit, period and time zone in the shape the CSV heading and print header take. */
export function forecastReportPeriod(
  report: ForecastAccuracyReport,
  timeZone: string,
): ReportPeriod {
  return {
    unitId: report.unit.id,
    unitCode: report.unit.code,
    unitName: report.unit.name,
    timeZone,
    from: report.period.from,
    to: report.period.to,
    groupBy: "patient",
    generatedAt: report.generatedAt,
  };
}

const closestWords = (summary: AccuracySummary): string | null =>
  summary.closest
    ? summary.closest.models.map((m) => FORECAST_MODEL_LABELS[m]).join(" and ") +
      (summary.closest.models.length > 1 ? " (tie)" : "")
    : null;

/** The headline numbers: changes, checked, coverage of the shown range, the closest model and its error. */
export function forecastTiles(report: ForecastAccuracyReport, unit: PressureUnit): Tile[] {
  const { counts, summary } = report;
  const closest = summary.closest;
  return [
    {
      key: "changes",
      label: "Changes recorded",
      value: formatCell(counts.changes, "int"),
      tone: "neutral",
    },
    {
      key: "checked",
      label: "Checked against a gas",
      value: formatCell(counts.checked, "int"),
      tone: "neutral",
    },
    {
      key: "coverage",
      label: "Measured within the shown range",
      value: formatCell(pct(summary.coverage.share), "pct"),
      unit: "%",
      tone: "neutral",
    },
    {
      key: "closest",
      label: "Closest model",
      value: closestWords(summary) ?? "–",
      tone: "neutral",
    },
    {
      key: "closestError",
      label: "Its median absolute error",
      value: closest
        ? formatCell(pressureValue(closest.medianAbsoluteError, unit), pressureFormat(unit))
        : "–",
      unit,
      tone: "neutral",
    },
  ];
}

/** Each model over a set of pairs: n, median absolute error, bias (median error) and mean error. */
export function modelTable(
  summary: AccuracySummary,
  unit: PressureUnit,
  id = "forecast-accuracy-models",
  title = "Forecast accuracy by model",
): ReportTable {
  const f = pressureFormat(unit);
  return {
    id,
    title,
    columns: [
      { key: "model", label: "Model", format: "text" },
      { key: "n", label: "Pairs", format: "int" },
      { key: "mae", label: `Median absolute error (${unit})`, format: f },
      { key: "bias", label: `Bias, median error (${unit})`, format: f },
      { key: "mean", label: `Mean error (${unit})`, format: f },
    ],
    rows: FORECAST_MODELS.map((m) => {
      const s = summary.models[m];
      return {
        key: m,
        cells: [
          s.label,
          s.n,
          pressureValue(s.medianAbsoluteError, unit),
          pressureValue(s.bias, unit),
          pressureValue(s.meanError, unit),
        ],
      };
    }),
  };
}

/** One row per group (device, FiO2 step band): pairs, coverage, each model's median absolute error and bias, the closest model. */
function groupedTable(
  id: string,
  title: string,
  first: string,
  groups: { key: string; label: string; summary: AccuracySummary }[],
  unit: PressureUnit,
): ReportTable {
  const f = pressureFormat(unit);
  const perModel = (what: string, key: string): ReportColumn[] =>
    FORECAST_MODELS.map((m) => ({
      key: `${key}-${m}`,
      label: `${MODEL_SHORT[m]} ${what} (${unit})`,
      format: f,
    }));
  const value = (s: AccuracySummary, pick: "medianAbsoluteError" | "bias", m: ForecastModel) =>
    pressureValue(s.models[m][pick], unit);
  return {
    id,
    title,
    columns: [
      { key: "group", label: first, format: "text" },
      { key: "n", label: "Pairs", format: "int" },
      { key: "coverage", label: "Within shown range (%)", format: "pct" },
      ...perModel("median abs. error", "mae"),
      ...perModel("bias", "bias"),
      { key: "closest", label: "Closest model", format: "text" },
    ],
    rows: groups.map((g) => ({
      key: g.key,
      cells: [
        g.label,
        g.summary.n,
        pct(g.summary.coverage.share),
        ...FORECAST_MODELS.map((m) => value(g.summary, "medianAbsoluteError", m)),
        ...FORECAST_MODELS.map((m) => value(g.summary, "bias", m)),
        closestWords(g.summary),
      ],
    })),
  };
}

export function deviceTable(report: ForecastAccuracyReport, unit: PressureUnit): ReportTable {
  return groupedTable(
    "forecast-accuracy-device",
    "Forecast accuracy by device",
    "Device",
    report.byDevice.map((d) => ({
      key: d.device,
      label: deviceLabel(d.device),
      summary: d.summary,
    })),
    unit,
  );
}

export function fio2StepTable(report: ForecastAccuracyReport, unit: PressureUnit): ReportTable {
  return groupedTable(
    "forecast-accuracy-fio2-step",
    "Forecast accuracy by FiO2 step",
    "FiO2 step",
    report.byFio2Step.map((b) => ({ key: b.band, label: b.label, summary: b.summary })),
    unit,
  );
}

/** Unchecked changes counted by reason, with what each reason means. */
export function reasonTable(report: ForecastAccuracyReport): ReportTable {
  return {
    id: "forecast-accuracy-unchecked-reasons",
    title: "Unchecked changes by reason",
    columns: [
      { key: "reason", label: "Reason", format: "text" },
      { key: "count", label: "Changes", format: "int" },
      { key: "definition", label: "What it means", format: "text" },
    ],
    rows: report.counts.byReason.map((r) => ({
      key: r.reason,
      cells: [r.label, r.count, UNCHECKED_REASONS[r.reason].definition],
    })),
  };
}

/** Every checked forecast: patient (a Chart link), bed, when, the step, the measured PaO2 and each model's forecast. */
export function pairsTable(
  report: ForecastAccuracyReport,
  unit: PressureUnit,
  timeZone: string,
): ReportTable {
  const f = pressureFormat(unit);
  const digits = pressureDigits(unit);
  const range = (low: number, high: number) =>
    `${pressureValue(low, unit)!.toFixed(digits)}–${pressureValue(high, unit)!.toFixed(digits)}`;
  return {
    id: "forecast-accuracy-pairs",
    title: "Checked forecasts",
    columns: [
      { key: "patient", label: "Patient", format: "text" },
      { key: "bed", label: "Bed", format: "text" },
      { key: "appliedAt", label: "Change applied", format: "text" },
      { key: "fio2", label: "FiO2", format: "text" },
      { key: "minutesAfter", label: "Gas after (min)", format: "int" },
      { key: "measured", label: `Measured PaO2 (${unit})`, format: f },
      ...FORECAST_MODELS.map((m) => ({
        key: `forecast-${m}`,
        label: `${MODEL_SHORT[m]} forecast (${unit})`,
        format: f,
      })),
      { key: "range", label: `Shown range (${unit})`, format: "text" },
      { key: "verdict", label: "Measured against the range", format: "text" },
      { key: "note", label: "Note", format: "text" },
    ],
    rows: report.pairs.map((p) => ({
      key: `${p.adjustmentId}-${p.gasId}`,
      patientId: p.patientId,
      cells: [
        p.patient,
        p.bed,
        unitClock(p.appliedAt, timeZone),
        fio2StepText(p.fromFio2, p.toFio2),
        Math.round(p.minutesAfter),
        pressureValue(p.measured, unit),
        ...FORECAST_MODELS.map((m) => pressureValue(p.models[m].predicted, unit)),
        range(p.range.low, p.range.high),
        VERDICT_WORDS[rangeVerdict(p)],
        p.peepChanged ? "PEEP changed too (not forecast)" : null,
      ],
    })),
  };
}

/** Every change not checked, with its reason and this case in words. */
export function uncheckedTable(report: ForecastAccuracyReport, timeZone: string): ReportTable {
  return {
    id: "forecast-accuracy-unchecked",
    title: "Unchecked changes",
    columns: [
      { key: "patient", label: "Patient", format: "text" },
      { key: "bed", label: "Bed", format: "text" },
      { key: "appliedAt", label: "Change applied", format: "text" },
      { key: "fio2", label: "FiO2", format: "text" },
      { key: "reason", label: "Reason", format: "text" },
      { key: "detail", label: "Detail", format: "text" },
    ],
    rows: report.unchecked.map((u) => ({
      key: String(u.adjustmentId),
      patientId: u.patientId,
      cells: [
        u.patient,
        u.bed,
        unitClock(u.appliedAt, timeZone),
        fio2StepText(u.fromFio2, u.toFio2),
        u.label,
        u.detail,
      ],
    })),
  };
}

export type CalibrationSeries = {
  model: ForecastModel;
  label: string;
  /** In the reader's unit, rounded as shown. */
  points: { measured: number; predicted: number; key: string }[];
};

/**
 * The calibration plot: one series per model of (measured, forecast) in the
 * reader's unit, and the end of both axes — the same for x and y so the
 * identity line is the diagonal — rounded up to a whole step (25 mmHg, 5 kPa).
 */
export function calibrationSeries(
  points: readonly CalibrationPoint[],
  unit: PressureUnit,
): { series: CalibrationSeries[]; axisMax: number } {
  const series = FORECAST_MODELS.map((model) => ({
    model,
    label: FORECAST_MODEL_LABELS[model],
    points: points
      .filter((p) => p.model === model)
      .map((p) => ({
        measured: pressureValue(p.measured, unit)!,
        predicted: pressureValue(p.predicted, unit)!,
        key: `${p.adjustmentId}-${p.gasId}`,
      })),
  }));
  const step = unit === "kPa" ? 5 : 25;
  const largest = Math.max(
    0,
    ...series.flatMap((s) => s.points.flatMap((p) => [p.measured, p.predicted])),
  );
  return { series, axisMax: Math.max(step, Math.ceil(largest / step) * step) };
}

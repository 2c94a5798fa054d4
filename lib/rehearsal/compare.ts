import { round, type ChartSpec } from "../reports/tables";
import { CARE_MODEL_LABELS, CARE_MODEL_ORDER, settingLines, type SettingLine } from "./labels";
import type { CareModel } from "./care";
import type { ModelSummary } from "./run";
import { MODEL_MEASURES, type RehearsalTable } from "./tables";
import type { RehearsalView } from "./views";

/**
 * Two runs side by side: which settings differ, one table with a column per
 * run and the difference for each measure and care model, and the grouped
 * chart of time in band. Run A is the one chosen first; the difference is
 * B − A. Columns and legends name runs by letter and number ("Run A (#12)"),
 * so they fit a phone; the page names both in full above them, the CSV in
 * its first line. Pure, no framework.
 */

type Run = Pick<RehearsalView, "id" | "label" | "settings" | "tables">;
type DoneRun = Run & { models: readonly ModelSummary[] };

/** How a run is named in a column: "ARDS … (#12)". */
export const runName = (run: Pick<RehearsalView, "id" | "label">) => `${run.label} (#${run.id})`;

export type SettingDiff = { key: string; label: string; a: string; b: string };

/** The settings (tables, band, limits, alerts, response times, cohort, seed) that differ. */
export function settingDiffs(a: Run, b: Run): SettingDiff[] {
  const linesB = new Map(settingLines(b).map((l) => [l.key, l]));
  return settingLines(a).flatMap((l: SettingLine) => {
    const other = linesB.get(l.key);
    return other && other.value !== l.value
      ? [{ key: l.key, label: l.label, a: l.value, b: other.value }]
      : [];
  });
}

/** B − A, rounded to the measure's places (one more than shown never helps the eye). */
export function difference(a: number, b: number, places: number): number {
  const d = round(b - a, places);
  return Object.is(d, -0) ? 0 : d;
}

const PLACES = { pct: 1, dec1: 1, dec2: 2, int: 0, text: 0 } as const;

/** Care models both runs have, in the page's order. */
function sharedModels(a: DoneRun, b: DoneRun): CareModel[] {
  return CARE_MODEL_ORDER.filter(
    (m) => a.models.some((s) => s.model === m) && b.models.some((s) => s.model === m),
  );
}

/**
 * One row per measure and care model: the measure, the model, run A, run B
 * and B − A (percentage points for shares).
 */
export function compareTable(a: DoneRun, b: DoneRun): RehearsalTable {
  const models = sharedModels(a, b);
  const find = (run: DoneRun, model: CareModel) => run.models.find((s) => s.model === model)!;
  return {
    id: "compare",
    title: "Measures of run A and run B",
    columns: [
      { key: "measure", label: "Measure", format: "text" },
      { key: "model", label: "Care model", format: "text" },
      { key: "a", label: `Run A (#${a.id})`, format: "dec2" },
      { key: "b", label: `Run B (#${b.id})`, format: "dec2" },
      { key: "difference", label: "B − A", format: "dec2", signed: true },
    ],
    rows: MODEL_MEASURES.flatMap((measure) =>
      models.map((model) => {
        const va = measure.value(find(a, model));
        const vb = measure.value(find(b, model));
        return {
          key: `${measure.key}-${model}`,
          cells: [
            measure.column,
            CARE_MODEL_LABELS[model],
            va,
            vb,
            difference(va, vb, PLACES[measure.format]),
          ],
          formats: [undefined, undefined, measure.format, measure.format, measure.format],
        };
      }),
    ),
  };
}

/** The grouped chart: pooled time in band per care model, one bar per run. */
export function compareChart(a: DoneRun, b: DoneRun): ChartSpec {
  const inBand = MODEL_MEASURES.find((m) => m.key === "inBand")!;
  return {
    title: "Time in band (pooled) by care model, per run",
    unit: "% of patient time",
    stacked: false,
    series: [
      { key: "a", label: `Run A (#${a.id})`, tone: "neutral" },
      { key: "b", label: `Run B (#${b.id})`, tone: "unknown" },
    ],
    points: sharedModels(a, b).map((model) => ({
      key: model,
      label: CARE_MODEL_LABELS[model],
      values: {
        a: inBand.value(a.models.find((s) => s.model === model)!),
        b: inBand.value(b.models.find((s) => s.model === model)!),
      },
    })),
  };
}

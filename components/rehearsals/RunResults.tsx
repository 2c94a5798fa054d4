"use client";

import { useEffect, useRef } from "react";
import { ReportChart } from "@/components/reports/ReportChart";
import { formatCell } from "@/lib/reports/tables";
import { CARE_MODEL_NOTES, settingLines } from "@/lib/rehearsal/labels";
import { modelsTable, modelTiles, shareChart, staysTable } from "@/lib/rehearsal/tables";
import type { RehearsalOutcome, RehearsalTableRef, RehearsalView } from "@/lib/rehearsal/views";
import { RehearsalTableView } from "./RehearsalTableView";

const VALUE_TONE: Record<string, string> = {
  inBand: "text-in-band",
  medianInBand: "text-in-band",
  below: "text-below",
  above: "text-above",
};

/** One card per care model: the measures of the run, by word (shares coloured by SpO2 state). */
export function ModelTiles({ outcome, runId }: { outcome: RehearsalOutcome; runId: number }) {
  return (
    <ul
      aria-label={`Care models of run #${runId}`}
      className="grid grid-cols-1 gap-3 md:grid-cols-3 print:grid-cols-3"
    >
      {modelTiles(outcome).map((tile) => (
        <li
          key={tile.model}
          data-testid={`model-tile-${tile.model}`}
          className="print-keep min-w-0 rounded-card border border-border bg-surface px-3 py-2 shadow-card"
        >
          <h3 className="font-semibold">{tile.label}</h3>
          <p className="text-xs text-ink-muted">{CARE_MODEL_NOTES[tile.model]}</p>
          <dl className="mt-2 space-y-1 text-sm">
            {tile.values.map((v) => (
              <div key={v.key} className="flex items-baseline justify-between gap-3">
                <dt className="min-w-0 text-ink-muted">{v.label}</dt>
                <dd className={`tabular shrink-0 font-medium ${VALUE_TONE[v.key] ?? ""}`}>
                  {formatCell(v.value, v.format)}
                  {v.unit ? ` ${v.unit}` : ""}
                </dd>
              </div>
            ))}
          </dl>
        </li>
      ))}
    </ul>
  );
}

function tableWords(t: RehearsalTableRef): string {
  const kind = t.id === null ? "" : t.builtIn ? ", published" : ", the unit's own";
  return `${t.name}${t.rows ? `, ${t.rows} steps` : ""}${kind}${t.source ? ` (${t.source})` : ""}`;
}

/** The basis: every figure the run used with its source, its settings and its tables. */
export function RunBasis({ view }: { view: RehearsalView }) {
  const ref = useRef<HTMLDetailsElement>(null);
  // Paper shows what the screen folds away.
  useEffect(() => {
    const open = () => {
      if (ref.current) ref.current.open = true;
    };
    window.addEventListener("beforeprint", open);
    return () => window.removeEventListener("beforeprint", open);
  }, []);
  const basis = view.outcome?.basis ?? [];
  return (
    <details
      ref={ref}
      className="rounded-card border border-border bg-surface px-3 py-2 print:border-0 print:px-0"
      data-testid="rehearsal-basis"
    >
      <summary className="cursor-pointer text-base font-semibold">
        Basis: the figures, settings and tables this run used
      </summary>
      <div className="mt-2 space-y-4 text-sm">
        <section aria-label="Step tables used" className="space-y-1">
          <h3 className="font-semibold">Step tables</h3>
          <dl className="space-y-1">
            <div>
              <dt className="text-ink-muted">Ventilated patients</dt>
              <dd>{tableWords(view.tables.ventilated)}</dd>
            </div>
            <div>
              <dt className="text-ink-muted">High-flow patients</dt>
              <dd>{tableWords(view.tables.hfnc)}</dd>
            </div>
          </dl>
        </section>
        <section aria-label="Settings of the run" className="space-y-1">
          <h3 className="font-semibold">Settings</h3>
          <dl className="grid gap-x-4 gap-y-1 sm:grid-cols-2">
            {settingLines(view).map((line) => (
              <div key={line.key} className="flex justify-between gap-3">
                <dt className="min-w-0 text-ink-muted">{line.label}</dt>
                <dd className="tabular shrink-0 text-right break-words">{line.value}</dd>
              </div>
            ))}
          </dl>
        </section>
        <section aria-label="Figures and sources" className="space-y-1">
          <h3 className="font-semibold">Figures and their sources</h3>
          {basis.length === 0 ? (
            <p className="text-ink-muted">
              {view.outcome
                ? "No figures came with this run."
                : "The figures and their sources are listed once the run is done."}
            </p>
          ) : (
            <dl className="space-y-2">
              {basis.map((b) => (
                <div key={b.name} className="print-keep">
                  <dt className="font-medium">{b.name}</dt>
                  <dd className="break-words">{b.value}</dd>
                  <dd className="text-xs text-ink-muted">Source: {b.source}</dd>
                </div>
              ))}
            </dl>
          )}
        </section>
      </div>
    </details>
  );
}

/** A finished run: tiles per care model, the chart beside its table, the per-patient table. */
export function RunResults({
  view,
  outcome,
  timeZone,
}: {
  view: RehearsalView;
  outcome: RehearsalOutcome;
  timeZone: string;
}) {
  const spec = shareChart(outcome);
  const runs = [view];
  return (
    <div className="space-y-5">
      <ModelTiles outcome={outcome} runId={view.id} />
      <section
        aria-label={`${spec.title}, run #${view.id}`}
        className="grid min-w-0 gap-4 lg:grid-cols-[minmax(0,2fr)_minmax(0,3fr)] print:grid-cols-1"
      >
        <ReportChart spec={spec} id={`rehearsal-${view.id}-shares`} />
        <RehearsalTableView
          table={modelsTable(outcome)}
          runs={runs}
          timeZone={timeZone}
          caption={`Care models of run #${view.id}, ${view.label}`}
          note="Shares are of the cohort's pooled time; the median is of each patient's own share. Rates are per patient-day."
        />
      </section>
      <RehearsalTableView
        table={staysTable(outcome)}
        runs={runs}
        timeZone={timeZone}
        caption={`Every patient under every care model, run #${view.id}`}
        note="Every virtual patient under each care model: the same patients and courses, only the care differs."
      />
    </div>
  );
}

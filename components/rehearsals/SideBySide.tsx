"use client";

import { ReportChart } from "@/components/reports/ReportChart";
import { compareChart, compareTable, runName, settingDiffs } from "@/lib/rehearsal/compare";
import { isActive, STATUS_LABELS } from "@/lib/rehearsal/labels";
import type { RehearsalView } from "@/lib/rehearsal/views";
import { RehearsalTableView } from "./RehearsalTableView";

/** The settings of two runs that differ, A before B. */
export function SettingDiffList({ a, b }: { a: RehearsalView; b: RehearsalView }) {
  const diffs = settingDiffs(a, b);
  return (
    <section aria-labelledby="compare-settings-heading" className="space-y-1">
      <h3 id="compare-settings-heading" className="text-base font-semibold">
        What differs between the runs
      </h3>
      {diffs.length === 0 ? (
        <p className="text-sm text-ink-muted">
          Nothing: the two runs were asked for with the same settings, tables and seed.
        </p>
      ) : (
        <dl className="divide-y divide-border rounded-card border border-border bg-surface text-sm">
          {diffs.map((d) => (
            <div key={d.key} className="grid gap-x-3 px-3 py-1.5 sm:grid-cols-[minmax(0,1fr)_auto]">
              <dt className="font-medium">{d.label}</dt>
              <dd className="tabular break-words">
                A: {d.a} · B: {d.b}
              </dd>
            </div>
          ))}
        </dl>
      )}
    </section>
  );
}

/**
 * Two runs side by side: what differs, then one table with a column per run
 * and the difference (B − A) for each measure and care model, beside a
 * grouped chart of time in band. Waits, in words, until both are done.
 */
export function SideBySide({
  a,
  b,
  timeZone,
}: {
  a: RehearsalView | undefined;
  b: RehearsalView | undefined;
  timeZone: string;
}) {
  const body = (() => {
    if (!a || !b)
      return (
        <p role="status" className="text-sm text-ink-muted">
          Loading both runs…
        </p>
      );
    const notDone = [a, b].filter((r) => r.status !== "done" || !r.outcome);
    if (notDone.length > 0)
      return (
        <>
          <SettingDiffList a={a} b={b} />
          <p role="status" className="text-sm text-ink-muted">
            The comparison appears when both runs are done:{" "}
            {notDone
              .map(
                (r) =>
                  `${runName(r)} is ${STATUS_LABELS[r.status].toLowerCase()}${isActive(r.status) ? "" : " and has no results"}`,
              )
              .join("; ")}
            .
          </p>
        </>
      );
    const runA = { ...a, models: a.outcome!.models };
    const runB = { ...b, models: b.outcome!.models };
    const spec = compareChart(runA, runB);
    return (
      <>
        <SettingDiffList a={a} b={b} />
        <div className="grid min-w-0 gap-4 lg:grid-cols-[minmax(0,2fr)_minmax(0,3fr)] print:grid-cols-1">
          <div className="min-w-0 lg:sticky lg:top-4 lg:self-start">
            <ReportChart spec={spec} id={`compare-${a.id}-${b.id}`} />
          </div>
          <RehearsalTableView
            table={compareTable(runA, runB)}
            runs={[a, b]}
            timeZone={timeZone}
            compact
            caption={`Run A, ${runName(a)}, and run B, ${runName(b)}, side by side`}
            note={`Run A: ${runName(a)}. Run B: ${runName(b)}. Differences of shares are in percentage points; rates are per patient-day.`}
          />
        </div>
      </>
    );
  })();
  return (
    <section
      aria-labelledby="compare-heading"
      className="min-w-0 space-y-3 border-t border-border pt-4"
      data-testid="side-by-side"
    >
      <h2 id="compare-heading" className="text-xl font-semibold break-words">
        Side by side
        {a && b ? (
          <span className="block text-sm font-normal text-ink-muted">
            A: {runName(a)} · B: {runName(b)}
          </span>
        ) : null}
      </h2>
      {body}
    </section>
  );
}

"use client";

import Link from "next/link";
import { EmptyState } from "@/components/ui/EmptyState";
import { unitClock } from "@/lib/reports/csv";
import { formatCell, pct } from "@/lib/reports/tables";
import { MAX_CHOSEN, rehearsalHref } from "@/lib/rehearsal/address";
import { cohortWords } from "@/lib/rehearsal/labels";
import type { RehearsalListItem } from "@/lib/rehearsal/views";
import { StatusChip } from "./StatusChip";

/** The Tidemark workflow's pooled time in band of a finished run, as the list writes it. */
export function tidemarkInBand(run: Pick<RehearsalListItem, "status" | "models">): string | null {
  if (run.status !== "done") return null;
  const tidemark = run.models?.find((m) => m.model === "tidemark");
  return tidemark ? `${formatCell(pct(tidemark.inBand), "pct")} %` : null;
}

/**
 * The unit's runs, newest first: name (a link that shows the run), who asked
 * for it and when (the unit's clock, 24-hour), the cohort, the status and,
 * when done, the Tidemark workflow's time in band. A checkbox per run chooses
 * up to two to compare side by side.
 */
export function RunsList({
  unitId,
  runs,
  chosen,
  timeZone,
  onToggle,
}: {
  unitId: number;
  runs: RehearsalListItem[];
  chosen: readonly number[];
  timeZone: string;
  onToggle: (id: number) => void;
}) {
  if (runs.length === 0)
    return (
      <EmptyState title="No runs yet">
        Nobody has rehearsed a protocol on this unit. Physicians and admins start one with “New
        run”; the results appear here for everyone on the unit.
      </EmptyState>
    );
  const full = chosen.length >= MAX_CHOSEN;
  return (
    <div className="space-y-2">
      <p id="runs-compare-hint" className="text-sm text-ink-muted">
        Tick up to two runs to compare them side by side.
        {full ? " Two are chosen: untick one to choose another." : ""}
      </p>
      <ul className="divide-y divide-border rounded-card border border-border bg-surface">
        {runs.map((run) => {
          const checked = chosen.includes(run.id);
          const inBand = tidemarkInBand(run);
          const boxId = `run-choose-${run.id}`;
          return (
            <li
              key={run.id}
              data-testid={`run-${run.id}`}
              className={`flex min-w-0 items-start gap-3 px-3 py-2 ${checked ? "bg-accent-soft" : ""}`}
            >
              <input
                id={boxId}
                type="checkbox"
                className="mt-1 size-4 shrink-0 accent-accent print:hidden"
                checked={checked}
                disabled={!checked && full}
                aria-describedby="runs-compare-hint"
                onChange={() => onToggle(run.id)}
              />
              <div className="min-w-0 flex-1 space-y-0.5">
                <div className="flex flex-wrap items-center gap-x-2 gap-y-1">
                  <label htmlFor={boxId} className="sr-only">
                    Choose “{run.label}” (#{run.id})
                  </label>
                  <Link
                    href={rehearsalHref(unitId, [run.id])}
                    scroll={false}
                    aria-current={chosen[0] === run.id ? "true" : undefined}
                    className="font-medium break-words text-accent underline"
                  >
                    {run.label}
                  </Link>
                  <span className="text-xs text-ink-muted">#{run.id}</span>
                  <StatusChip status={run.status} />
                </div>
                <p className="text-xs break-words text-ink-muted">
                  {run.requestedBy.name} ·{" "}
                  <time dateTime={run.createdAt}>{unitClock(run.createdAt, timeZone)}</time> ·{" "}
                  {cohortWords(run.settings)} · seed {run.settings.seed}
                </p>
                {inBand ? (
                  <p className="text-sm">
                    Tidemark workflow in band: <span className="tabular font-medium">{inBand}</span>
                  </p>
                ) : run.status === "failed" ? (
                  <p className="text-sm text-ink-muted">
                    Did not finish: {run.error ?? "no reason given"}
                  </p>
                ) : null}
              </div>
            </li>
          );
        })}
      </ul>
    </div>
  );
}

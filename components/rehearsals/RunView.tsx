"use client";

import { useEffect, useRef } from "react";
import useSWR from "swr";
import type { ApiRequestError } from "@/components/ui/api-json";
import { LoadError } from "@/components/ui/LoadError";
import { IconWarning } from "@/components/ui/icons";
import { unitClock } from "@/lib/reports/csv";
import { cohortWords, isActive } from "@/lib/rehearsal/labels";
import type { RehearsalView } from "@/lib/rehearsal/views";
import { fetchRun, runUrl } from "./rehearsal-request";
import { RunBasis, RunResults } from "./RunResults";
import { StatusChip } from "./StatusChip";

/** How often a queued or running run is asked for again. */
export const POLL_MS = 700;

/**
 * One run, from the server's first answer and then polled every 700 ms while
 * the worker has it; polling stops once it is done or failed. `onSettled`
 * hears the moment it finishes (the list refreshes).
 */
export function useRun(
  id: number | null,
  fallback: RehearsalView | undefined,
  onSettled?: (run: RehearsalView) => void,
) {
  const swr = useSWR<RehearsalView, ApiRequestError>(id === null ? null : runUrl(id), fetchRun, {
    ...(fallback ? { fallbackData: fallback } : {}),
    refreshInterval: (latest) => (latest && !isActive(latest.status) ? 0 : POLL_MS),
    // SWR's 2 s de-duplication would stretch the 700 ms poll.
    dedupingInterval: 200,
    revalidateOnFocus: false,
  });
  const status = swr.data?.status;
  const seen = useRef(status);
  useEffect(() => {
    const before = seen.current;
    seen.current = status;
    if (swr.data && status && before && isActive(before) && !isActive(status))
      onSettled?.(swr.data);
  }, [status, swr.data, onSettled]);
  return swr;
}

/** The progress bar while the worker has the run: "Rehearsal progress", in %. */
export function RunProgress({
  run,
}: {
  run: Pick<RehearsalView, "status" | "progress" | "settings">;
}) {
  const percent = Math.max(0, Math.min(100, Math.round(run.progress * 100)));
  const done = Math.round(run.progress * run.settings.patients);
  return (
    <div className="space-y-1" data-testid="run-progress">
      <div
        role="progressbar"
        aria-label="Rehearsal progress"
        aria-valuemin={0}
        aria-valuemax={100}
        aria-valuenow={percent}
        aria-valuetext={`${percent} %`}
        className="h-3 w-full overflow-hidden rounded-full border border-border-strong bg-surface-muted"
      >
        <div className="h-full bg-accent transition-[width]" style={{ width: `${percent}%` }} />
      </div>
      <p className="text-sm text-ink-muted" aria-live="polite">
        {run.status === "queued"
          ? "Queued: the worker starts it shortly."
          : `Running: ${done} of ${run.settings.patients} patients (${percent} %).`}
      </p>
    </div>
  );
}

/** A run's header line: who asked for it and when, the cohort, the seed, how long it took. */
function RunFacts({ run, timeZone }: { run: RehearsalView; timeZone: string }) {
  const elapsed = run.outcome ? ` · ran ${(run.outcome.elapsedMs / 1000).toFixed(1)} s` : "";
  return (
    <p className="text-sm break-words text-ink-muted">
      {run.unitCode} · asked for by {run.requestedBy.name} on{" "}
      <time dateTime={run.createdAt}>{unitClock(run.createdAt, timeZone)}</time> ·{" "}
      {cohortWords(run.settings)} · seed {run.settings.seed}
      {run.finishedAt ? (
        <>
          {" "}
          · finished <time dateTime={run.finishedAt}>{unitClock(run.finishedAt, timeZone)}</time>
        </>
      ) : null}
      {elapsed}
    </p>
  );
}

/** The selected run: progress while queued or running, its error if it failed, else its results. */
export function RunView({
  id,
  run,
  error,
  onRetry,
  timeZone,
  focusOnMount = false,
}: {
  id: number;
  /** The run as last loaded (useRun); undefined while the first answer is on its way. */
  run: RehearsalView | undefined;
  error: ApiRequestError | undefined;
  onRetry: () => void;
  timeZone: string;
  /** Just queued from the form: move focus (and the eye) to its progress. */
  focusOnMount?: boolean;
}) {
  const heading = useRef<HTMLHeadingElement>(null);
  useEffect(() => {
    if (focusOnMount) {
      heading.current?.focus();
      heading.current?.scrollIntoView({ block: "start" });
    }
  }, [focusOnMount]);

  const headingId = `run-${id}-heading`;
  return (
    <section
      aria-labelledby={headingId}
      className="min-w-0 space-y-4 border-t border-border pt-4"
      data-testid={`run-view-${id}`}
    >
      {!run && error ? (
        <>
          <h2 id={headingId} ref={heading} tabIndex={-1} className="text-xl font-semibold">
            Run #{id}
          </h2>
          <LoadError what={`run #${id}`} message={error.message} onRetry={onRetry} />
        </>
      ) : !run ? (
        <div aria-busy="true" className="space-y-2">
          <h2 id={headingId} ref={heading} tabIndex={-1} className="text-xl font-semibold">
            Run #{id}
          </h2>
          <p role="status" className="text-sm text-ink-muted">
            Loading the run…
          </p>
          <div className="h-24 animate-pulse rounded-card bg-surface-muted" />
        </div>
      ) : (
        <>
          <header className="space-y-1">
            <div className="flex flex-wrap items-center gap-2">
              <h2
                id={headingId}
                ref={heading}
                tabIndex={-1}
                className="min-w-0 text-xl font-semibold break-words"
              >
                {run.label} <span className="font-normal text-ink-muted">#{run.id}</span>
              </h2>
              <StatusChip status={run.status} />
            </div>
            <RunFacts run={run} timeZone={timeZone} />
          </header>
          {isActive(run.status) ? <RunProgress run={run} /> : null}
          {run.status === "failed" ? (
            <p
              role="alert"
              className="flex items-start gap-2 rounded-md border border-border-strong px-3 py-2 text-sm"
            >
              <IconWarning className="mt-0.5 shrink-0" />
              <span>The run did not finish: {run.error ?? "the worker gave no reason."}</span>
            </p>
          ) : null}
          {run.status === "done" && run.outcome ? (
            <RunResults view={run} outcome={run.outcome} timeZone={timeZone} />
          ) : null}
          {error && run ? (
            <p role="status" className="text-xs text-ink-muted">
              The last update could not be loaded ({error.message}); trying again.
            </p>
          ) : null}
          <RunBasis view={run} />
        </>
      )}
    </section>
  );
}

"use client";

import { LoadError } from "@/components/ui/LoadError";
import { useState } from "react";
import useSWRInfinite from "swr/infinite";
import { formatPressureNumber } from "@/components/oxygenation/format";
import { Button } from "@/components/ui/Button";
import { EmptyState } from "@/components/ui/EmptyState";
import { formatPfRatio, type PressureUnit } from "@/lib/oxygen/units";
import type { TimelineItem, TimelineKind, TimelinePage } from "@/lib/chart/timeline";
import { collapseReadingRuns } from "@/lib/chart/timeline-runs";
import { type ChartRequestError, formatUnitTime, getChartJson } from "./chart-request";

export const TIMELINE_PAGE_SIZE = 25;

const KINDS: { kind: TimelineKind; label: string }[] = [
  { kind: "order", label: "Orders" },
  { kind: "adjustment", label: "Adjustments" },
  { kind: "reading", label: "Readings" },
  { kind: "blood_gas", label: "Blood gases" },
];
// Alerts join this list when they exist (a later issue).

const KIND_WORD: Record<TimelineKind, string> = {
  order: "Order",
  adjustment: "Adjustment",
  reading: "Reading",
  blood_gas: "Blood gas",
};

const KIND_LOOK: Record<TimelineKind, string> = {
  order: "bg-accent-soft text-accent-strong",
  adjustment: "bg-overdue-soft text-overdue",
  reading: "bg-surface-muted text-ink",
  blood_gas: "bg-above-soft text-above",
};

/** The pressures of a row, in the user's unit, with the unit beside each value. */
export function pressureText(item: TimelineItem, unit: PressureUnit): string | null {
  const v = item.values;
  if (v.pao2MmHg === undefined) return null;
  const parts = [`PaO2 ${formatPressureNumber(v.pao2MmHg, unit)} ${unit}`];
  if (v.paco2MmHg !== undefined)
    parts.push(`PaCO2 ${formatPressureNumber(v.paco2MmHg, unit)} ${unit}`);
  if (v.pfRatio !== undefined && v.pfRatio !== null)
    parts.push(`P/F ${formatPfRatio(v.pfRatio, unit)}`);
  return parts.join(", ");
}

export function TimelineLoading() {
  return (
    <div className="space-y-2" aria-busy="true" data-testid="timeline-loading">
      <p role="status" className="sr-only">
        Loading the timeline…
      </p>
      {Array.from({ length: 5 }, (_, i) => (
        <div key={i} className="h-10 animate-pulse rounded bg-surface-muted" />
      ))}
    </div>
  );
}

/** The rows of the timeline, newest first, times on the unit's clock. */
export function TimelineTable({
  items,
  timeZone,
  pressureUnit,
}: {
  items: TimelineItem[];
  timeZone: string;
  pressureUnit: PressureUnit;
}) {
  return (
    <div className="overflow-x-auto rounded-card border border-border bg-surface shadow-card">
      <table className="w-full text-left text-sm" data-testid="timeline-table">
        <caption className="sr-only">Timeline, newest first</caption>
        <thead className="border-b border-border bg-surface-muted text-xs tracking-wide text-ink-muted">
          <tr>
            <th scope="col" className="px-3 py-2 font-medium">
              Time
            </th>
            <th scope="col" className="px-3 py-2 font-medium">
              Kind
            </th>
            <th scope="col" className="px-3 py-2 font-medium">
              Entry
            </th>
            <th scope="col" className="px-3 py-2 font-medium">
              By
            </th>
          </tr>
        </thead>
        <tbody>
          {collapseReadingRuns(items).map(({ item, count, firstAt }) => {
            const pressures = pressureText(item, pressureUnit);
            const stopped = item.discontinued;
            return (
              <tr
                key={item.cursor}
                className="border-b border-border align-top last:border-b-0"
                data-kind={item.kind}
                data-count={count}
              >
                <td className="tabular px-3 py-2 whitespace-nowrap">
                  {count > 1 ? (
                    <>
                      <time dateTime={firstAt}>{formatUnitTime(firstAt, timeZone)}</time>
                      {" – "}
                      <time dateTime={item.at}>{formatUnitTime(item.at, timeZone)}</time>
                    </>
                  ) : (
                    <time dateTime={item.at}>{formatUnitTime(item.at, timeZone)}</time>
                  )}
                </td>
                <td className="px-3 py-2">
                  <span
                    className={`inline-block rounded-full px-2 py-0.5 text-xs font-medium whitespace-nowrap ${KIND_LOOK[item.kind]}`}
                  >
                    {KIND_WORD[item.kind]}
                  </span>
                </td>
                <td className="min-w-0 px-3 py-2">
                  <p className="break-words">
                    {item.summary}
                    {pressures ? <span className="tabular">{`: ${pressures}`}</span> : null}
                    {count > 1 ? (
                      <span className="text-ink-muted">{` — ${count} identical readings`}</span>
                    ) : null}
                  </p>
                  {stopped ? (
                    <p className="mt-0.5 text-xs break-words" data-testid="timeline-discontinued">
                      {`Discontinued ${formatUnitTime(stopped.at, timeZone)} by ${stopped.by ?? "an unknown user"}`}
                      {stopped.reason ? `: ${stopped.reason}` : ""}
                    </p>
                  ) : null}
                  {item.rationale ? (
                    <p className="mt-0.5 line-clamp-2 text-xs break-words text-ink-muted">
                      {item.rationale}
                    </p>
                  ) : null}
                </td>
                <td className="px-3 py-2 text-ink-muted">{item.who ?? "Monitor"}</td>
              </tr>
            );
          })}
        </tbody>
      </table>
    </div>
  );
}

/**
 * The Chart's timeline: orders, adjustments, readings and blood gases of the
 * current admission, newest first, filtered by kind, "Load older" follows the
 * cursor. Pressures in the user's unit.
 */
export function Timeline({
  patientId,
  pressureUnit,
}: {
  patientId: number;
  pressureUnit: PressureUnit;
}) {
  const [kinds, setKinds] = useState<TimelineKind[]>(KINDS.map((k) => k.kind));
  const { data, error, size, setSize, isLoading, isValidating, mutate } = useSWRInfinite<
    TimelinePage,
    ChartRequestError
  >(
    (index: number, previous: TimelinePage | null) => {
      if (kinds.length === 0) return null;
      if (previous && previous.nextCursor === null) return null;
      const params = new URLSearchParams({ limit: String(TIMELINE_PAGE_SIZE) });
      if (kinds.length < KINDS.length) params.set("kinds", kinds.join(","));
      if (previous?.nextCursor) params.set("before", previous.nextCursor);
      return `/api/v1/patients/${patientId}/timeline?${params.toString()}`;
    },
    (url: string) => getChartJson<TimelinePage>(url),
    { revalidateFirstPage: false },
  );

  const items = data?.flatMap((page) => page.items) ?? [];
  const lastPage = data?.[data.length - 1];
  const timeZone = data?.[0]?.timeZone ?? "UTC";
  const loadingOlder = isValidating && data !== undefined && data.length < size;
  const toggle = (kind: TimelineKind, on: boolean) =>
    setKinds((current) =>
      KINDS.map((k) => k.kind).filter((k) => (k === kind ? on : current.includes(k))),
    );

  return (
    <section aria-labelledby="timeline-heading" className="space-y-3" data-testid="timeline">
      <div className="flex flex-wrap items-center justify-between gap-3">
        <h2 id="timeline-heading" className="text-lg font-semibold">
          Timeline
        </h2>
        <fieldset
          className="flex flex-wrap items-center gap-x-4 gap-y-1 text-sm"
          data-testid="timeline-filters"
        >
          <legend className="sr-only">Show in the timeline</legend>
          <span aria-hidden className="text-ink-muted">
            Show
          </span>
          {KINDS.map((k) => (
            <label key={k.kind} className="inline-flex cursor-pointer items-center gap-1.5">
              <input
                type="checkbox"
                className="size-4 accent-accent"
                checked={kinds.includes(k.kind)}
                onChange={(e) => toggle(k.kind, e.target.checked)}
              />
              {k.label}
            </label>
          ))}
        </fieldset>
      </div>

      {kinds.length === 0 ? (
        <EmptyState title="Nothing chosen to show">
          Tick at least one kind of entry above.
        </EmptyState>
      ) : error && items.length === 0 ? (
        <LoadError what="the timeline" message={error.message} onRetry={() => void mutate()} />
      ) : isLoading || data === undefined ? (
        <TimelineLoading />
      ) : items.length === 0 ? (
        <EmptyState
          title={
            kinds.length === KINDS.length ? "Nothing charted yet" : "No entries of these kinds"
          }
        >
          {kinds.length === KINDS.length
            ? "No order, adjustment, reading or blood gas has been charted in this admission yet."
            : "Nothing of the chosen kinds has been charted in this admission. Tick more kinds above."}
        </EmptyState>
      ) : (
        <>
          <TimelineTable items={items} timeZone={timeZone} pressureUnit={pressureUnit} />
          <div className="flex flex-wrap items-center gap-3">
            <p className="text-sm text-ink-muted" aria-live="polite" data-testid="timeline-count">
              Showing <span className="tabular">{items.length}</span>{" "}
              {items.length === 1 ? "entry" : "entries"}, newest first
              {lastPage?.nextCursor === null
                ? " — the oldest entry of this admission is shown"
                : ""}
              . Times are on the unit&apos;s clock ({timeZone}).
            </p>
            {error ? (
              <LoadError
                what="the timeline"
                message={error.message}
                onRetry={() => void mutate()}
              />
            ) : null}
            {lastPage?.nextCursor ? (
              <Button
                variant="secondary"
                className="ml-auto"
                disabled={loadingOlder}
                aria-busy={loadingOlder}
                onClick={() => void setSize(size + 1)}
              >
                {loadingOlder ? "Loading older entries…" : "Load older"}
              </Button>
            ) : null}
          </div>
        </>
      )}
    </section>
  );
}

"use client";

import { LoadError } from "@/components/ui/LoadError";
import { type KeyboardEvent, type PointerEvent, useId, useMemo, useState } from "react";
import useSWR from "swr";
import { EmptyState } from "@/components/ui/EmptyState";
import type { PressureUnit } from "@/lib/oxygen/units";
import type { Trend } from "@/lib/chart/trend";
import {
  type ChartRequestError,
  formatUnitTime,
  getChartJson,
  rangeBounds,
  TREND_RANGES,
  type TrendRangeKey,
} from "./chart-request";
import { TrendDetailsBox, TrendLegend } from "./TrendLegend";
import { TrendGasesPanel } from "./TrendGasesPanel";
import { TrendSettingsPanel } from "./TrendSettingsPanel";
import { TrendSpo2Panel } from "./TrendSpo2Panel";
import { TrendTable } from "./TrendTable";
import { trendDetails } from "./trend-details";
import {
  AXIS_Y,
  H,
  HOUR,
  M,
  type Moment,
  nearestMoment,
  PW,
  SPO2,
  trendMoments,
  trendScales,
  W,
} from "./trend-geometry";

export { trendDetails };

/** The drawing of one loaded trend: three panels on one time axis, the details, and a hidden data table. */
export function TrendPlot({ trend, pressureUnit }: { trend: Trend; pressureUnit: PressureUnit }) {
  const id = useId();
  const [selected, setSelected] = useState<Moment | null>(null);
  const scales = trendScales(trend, pressureUnit);
  const { from, span, x, timeTicks } = scales;

  const moments = useMemo(() => trendMoments(trend), [trend]);

  const onPointerMove = (event: PointerEvent<SVGSVGElement>) => {
    const rect = event.currentTarget.getBoundingClientRect();
    if (rect.width === 0) return;
    const vx = ((event.clientX - rect.left) / rect.width) * W;
    const t = from + ((vx - M.left) / PW) * span;
    setSelected(nearestMoment(moments, t));
  };

  const onKeyDown = (event: KeyboardEvent<HTMLDivElement>) => {
    if (moments.length === 0) return;
    const index = selected === null ? -1 : moments.indexOf(selected);
    let next: number | undefined;
    if (event.key === "ArrowRight")
      next = index < 0 ? moments.length - 1 : Math.min(moments.length - 1, index + 1);
    else if (event.key === "ArrowLeft")
      next = index < 0 ? moments.length - 1 : Math.max(0, index - 1);
    else if (event.key === "Home") next = 0;
    else if (event.key === "End") next = moments.length - 1;
    else if (event.key === "Escape") {
      setSelected(null);
      return;
    }
    if (next === undefined) return;
    event.preventDefault();
    setSelected(moments[next] ?? null);
  };

  const details = selected === null ? null : trendDetails(trend, selected, pressureUnit);
  const description =
    `SpO2 from ${formatUnitTime(trend.from, trend.timeZone)} to ${formatUnitTime(trend.to, trend.timeZone)}: ` +
    `${trend.spo2Count} ${trend.spo2Count === 1 ? "reading" : "readings"}, ${trend.bands.length} order ${trend.bands.length === 1 ? "period" : "periods"}, ` +
    `${trend.settings.length} settings ${trend.settings.length === 1 ? "step" : "steps"}, ${trend.gases.length} arterial ${trend.gases.length === 1 ? "gas" : "gases"}. The table below lists every value.`;

  return (
    <figure className="min-w-0 space-y-2">
      <div
        tabIndex={0}
        role="group"
        aria-label="Trend chart. Use the left and right arrow keys to step through the charted moments."
        aria-describedby={`${id}-desc`}
        onKeyDown={onKeyDown}
        onBlur={() => setSelected(null)}
        className="rounded-md"
        data-testid="trend-plot"
      >
        <svg
          viewBox={`0 0 ${W} ${H}`}
          className="h-auto w-full touch-none"
          role="img"
          aria-labelledby={`${id}-title ${id}-desc`}
          onPointerMove={onPointerMove}
          onPointerLeave={() => setSelected(null)}
        >
          <title id={`${id}-title`}>SpO2, settings and arterial gases over time</title>
          <desc id={`${id}-desc`}>{description}</desc>
          <g aria-hidden>
            <TrendSpo2Panel trend={trend} scales={scales} />

            <TrendSettingsPanel trend={trend} scales={scales} />

            <TrendGasesPanel trend={trend} scales={scales} pressureUnit={pressureUnit} />

            {/* Time axis on the unit's clock. */}
            <line
              x1={M.left}
              x2={M.left + PW}
              y1={AXIS_Y}
              y2={AXIS_Y}
              className="stroke-border-strong"
            />
            {timeTicks.map((t) => (
              <g key={t}>
                <line
                  x1={x(t)}
                  x2={x(t)}
                  y1={SPO2.top}
                  y2={AXIS_Y + 4}
                  className="stroke-border"
                  strokeDasharray="2 4"
                />
                <text
                  x={x(t)}
                  y={AXIS_Y + 17}
                  textAnchor="middle"
                  className="tabular fill-ink-muted text-[11px]"
                >
                  {span > 24 * HOUR
                    ? formatUnitTime(t, trend.timeZone)
                    : formatUnitTime(t, trend.timeZone).slice(-5)}
                </text>
              </g>
            ))}
            {selected !== null ? (
              <line
                x1={x(selected)}
                x2={x(selected)}
                y1={SPO2.top}
                y2={AXIS_Y}
                strokeWidth="1.5"
                className="stroke-ink"
              />
            ) : null}
          </g>
        </svg>
      </div>

      <TrendDetailsBox details={details} />

      <TrendLegend trend={trend} second={scales.second} pressureUnit={pressureUnit} />

      <TrendTable trend={trend} pressureUnit={pressureUnit} />
    </figure>
  );
}

export function TrendLoading() {
  return (
    <div aria-busy="true" data-testid="trend-loading" className="space-y-2">
      <p role="status" className="sr-only">
        Loading the trend…
      </p>
      <div className="h-64 animate-pulse rounded-md bg-surface-muted" />
      <div className="h-10 animate-pulse rounded-md bg-surface-muted" />
    </div>
  );
}

/** The range picker: a radio group, keyboard-complete by the browser's own arrow keys. */
export function TrendRangePicker({
  value,
  onChange,
}: {
  value: TrendRangeKey;
  onChange: (key: TrendRangeKey) => void;
}) {
  const name = useId();
  return (
    <fieldset data-testid="trend-range">
      <legend className="sr-only">Time range</legend>
      <div className="inline-flex overflow-hidden rounded-md border border-border-strong">
        {TREND_RANGES.map((r) => (
          <label
            key={r.key}
            className="cursor-pointer border-l border-border-strong px-3 py-1.5 text-sm font-medium text-ink first:border-l-0 has-[:checked]:bg-accent has-[:checked]:text-on-accent has-[:focus-visible]:outline has-[:focus-visible]:outline-2 has-[:focus-visible]:outline-offset-[-4px] has-[:focus-visible]:outline-focus"
          >
            <input
              type="radio"
              name={name}
              value={r.key}
              checked={value === r.key}
              onChange={() => onChange(r.key)}
              className="sr-only"
            />
            {r.label}
          </label>
        ))}
      </div>
    </fieldset>
  );
}

/**
 * The Chart's trend: SpO2 with each order's target band shaded, FiO2 and
 * PEEP or flow as steps, PaO2 and P/F as points, over 6 h, 24 h, 72 h or the
 * stay; pressures in the user's unit.
 */
export function TrendChart({
  patientId,
  pressureUnit,
  admittedAt,
}: {
  patientId: number;
  pressureUnit: PressureUnit;
  /** ISO time of admission: where "Stay" starts. */
  admittedAt: string;
}) {
  const [rangeKey, setRangeKey] = useState<TrendRangeKey>("24h");
  const [bounds, setBounds] = useState(() => rangeBounds("24h", admittedAt, Date.now()));
  const url = `/api/v1/patients/${patientId}/trend?from=${encodeURIComponent(bounds.from)}&to=${encodeURIComponent(bounds.to)}`;
  const { data, error, isLoading, isValidating, mutate } = useSWR<Trend, ChartRequestError>(
    url,
    (u: string) => getChartJson<Trend>(u),
    {
      keepPreviousData: true,
    },
  );
  const pick = (key: TrendRangeKey) => {
    setRangeKey(key);
    setBounds(rangeBounds(key, admittedAt, Date.now()));
  };
  const empty =
    data !== undefined &&
    data.spo2.length === 0 &&
    data.bands.length === 0 &&
    data.settings.length === 0 &&
    data.gases.length === 0;

  return (
    <section aria-labelledby="trend-heading" className="space-y-3" data-testid="trend">
      <div className="flex flex-wrap items-center justify-between gap-3">
        <h2 id="trend-heading" className="text-lg font-semibold">
          Trend
        </h2>
        <div className="flex items-center gap-3">
          {isValidating && data ? (
            <span role="status" className="text-xs text-ink-muted">
              Updating…
            </span>
          ) : null}
          <TrendRangePicker value={rangeKey} onChange={pick} />
        </div>
      </div>
      <div className="rounded-card border border-border bg-surface p-3 shadow-card sm:p-4">
        {error && !data ? (
          <LoadError what="the trend" message={error.message} onRetry={() => void mutate()} />
        ) : isLoading || !data ? (
          <TrendLoading />
        ) : empty ? (
          <EmptyState title="Nothing charted in this range">
            No readings yet and no order in effect in this range. SpO2 readings, orders, adjustments
            and arterial gases appear here as they are charted; try a longer range.
          </EmptyState>
        ) : (
          <>
            {data.bands.length === 0 ? (
              <p className="mb-2 text-sm text-ink-muted">
                No order in effect in this range, so there is no target band to shade.
              </p>
            ) : null}
            <TrendPlot trend={data} pressureUnit={pressureUnit} />
          </>
        )}
      </div>
    </section>
  );
}

"use client";

import { LoadError } from "@/components/ui/LoadError";
import {
  type KeyboardEvent,
  type PointerEvent,
  type ReactNode,
  useId,
  useMemo,
  useState,
} from "react";
import useSWR from "swr";
import { formatPressureNumber, niceAxis, pressureIn } from "@/components/oxygenation/format";
import { EmptyState } from "@/components/ui/EmptyState";
import { formatPfRatio, type PressureUnit } from "@/lib/oxygen/units";
import type { Trend, TrendBand, TrendSettingsStep } from "@/lib/patients/trend";
import {
  type ChartRequestError,
  formatUnitTime,
  getChartJson,
  rangeBounds,
  TREND_RANGES,
  type TrendRangeKey,
} from "./chart-request";

const W = 960;
const M = { left: 58, right: 62 };
const PW = W - M.left - M.right;
const SPO2 = { top: 14, height: 170 };
const SETTINGS = { top: 222, height: 84 };
const GASES = { top: 344, height: 84 };
const AXIS_Y = GASES.top + GASES.height;
const H = AXIS_Y + 26;
const HOUR = 3600_000;
const TICK_STEPS_H = [1, 2, 3, 6, 12, 24, 48, 96, 168];

type Moment = number;

function latestAtOrBefore<T extends { at: string }>(items: readonly T[], t: number): T | undefined {
  let found: T | undefined;
  for (const item of items) {
    if (Date.parse(item.at) <= t) found = item;
    else break;
  }
  return found;
}

function bandAt(bands: readonly TrendBand[], t: number): TrendBand | undefined {
  return bands.find((b) => Date.parse(b.from) <= t && t < Date.parse(b.to));
}

const fio2Text = (v: number) => v.toFixed(2);

/** Which second setting the step panel draws beside FiO2: PEEP on ventilation, flow on HFNC and low-flow devices. */
function secondSetting(settings: readonly TrendSettingsStep[]): "peep" | "flow" | null {
  if (settings.some((s) => s.peepCmH2O !== null)) return "peep";
  if (settings.some((s) => s.flowLMin !== null)) return "flow";
  return null;
}

/** The details of one moment, in words: what the tooltip, the live region and tests read. */
export function trendDetails(trend: Trend, t: number, pressureUnit: PressureUnit): string[] {
  const lines = [formatUnitTime(t, trend.timeZone)];
  const reading = latestAtOrBefore(trend.spo2, t);
  const band = bandAt(trend.bands, t);
  if (reading) {
    const word = band
      ? reading.spo2Pct < band.lowerPct
        ? " (below band)"
        : reading.spo2Pct > band.upperPct
          ? " (above band)"
          : " (in band)"
      : "";
    lines.push(`SpO2 ${reading.spo2Pct} %${word} at ${formatUnitTime(reading.at, trend.timeZone)}`);
  } else lines.push("No SpO2 reading yet");
  lines.push(band ? `Target band ${band.lowerPct}–${band.upperPct} %` : "No order in effect");
  const step = latestAtOrBefore(trend.settings, t);
  if (step && step.fio2 !== null) {
    const parts = [`FiO2 ${fio2Text(step.fio2)}`];
    if (step.peepCmH2O !== null) parts.push(`PEEP ${step.peepCmH2O} cmH2O`);
    if (step.flowLMin !== null) parts.push(`flow ${step.flowLMin} L/min`);
    lines.push(parts.join(", "));
  }
  const gas = latestAtOrBefore(trend.gases, t);
  if (gas) {
    lines.push(
      `Arterial gas at ${formatUnitTime(gas.at, trend.timeZone)}: PaO2 ${formatPressureNumber(gas.pao2MmHg, pressureUnit)} ${pressureUnit}` +
        (gas.pfRatio === null ? "" : `, P/F ${formatPfRatio(gas.pfRatio, pressureUnit)}`),
    );
  }
  return lines;
}

function stepPath(
  steps: readonly TrendSettingsStep[],
  value: (s: TrendSettingsStep) => number | null,
  x: (t: number) => number,
  y: (v: number) => number,
  end: number,
): string {
  let d = "";
  let penDown = false;
  steps.forEach((s, i) => {
    const v = value(s);
    const next = steps[i + 1];
    if (v === null) {
      penDown = false;
      return;
    }
    const x0 = x(Date.parse(s.at)).toFixed(1);
    const x1 = x(next ? Date.parse(next.at) : end).toFixed(1);
    const yv = y(v).toFixed(1);
    d += `${penDown ? "L" : "M"}${x0},${yv} L${x1},${yv} `;
    penDown = true;
  });
  return d.trim();
}

/** The drawing of one loaded trend: three panels on one time axis, the details, and a hidden data table. */
export function TrendPlot({ trend, pressureUnit }: { trend: Trend; pressureUnit: PressureUnit }) {
  const id = useId();
  const [selected, setSelected] = useState<Moment | null>(null);
  const from = Date.parse(trend.from);
  const to = Date.parse(trend.to);
  const span = Math.max(60_000, to - from);
  const x = (t: number) => M.left + ((Math.min(Math.max(t, from), to) - from) / span) * PW;

  const lowest = Math.min(
    88,
    ...trend.spo2.map((p) => p.spo2Pct),
    ...trend.bands.map((b) => b.lowerPct),
  );
  const spo2Min = Math.max(50, Math.floor((lowest - 2) / 5) * 5);
  const ySpo2 = (v: number) => SPO2.top + ((100 - v) / (100 - spo2Min)) * SPO2.height;
  const spo2Ticks = Array.from(
    { length: Math.floor((100 - spo2Min) / 5) + 1 },
    (_, i) => 100 - i * 5,
  ).filter((v, i, all) => all.length <= 7 || i % 2 === 0);

  const second = secondSetting(trend.settings);
  const secondMax =
    second === "peep"
      ? niceAxis(Math.max(15, ...trend.settings.map((s) => s.peepCmH2O ?? 0))).max
      : niceAxis(Math.max(10, ...trend.settings.map((s) => s.flowLMin ?? 0))).max;
  const yFio2 = (v: number) => SETTINGS.top + ((1 - v) / (1 - 0.2)) * SETTINGS.height;
  const ySecond = (v: number) => SETTINGS.top + (1 - v / secondMax) * SETTINGS.height;

  const pao2Axis = niceAxis(
    Math.max(
      pressureIn(120, pressureUnit),
      ...trend.gases.map((g) => pressureIn(g.pao2MmHg, pressureUnit)),
    ),
  );
  // P/F carries PaO2's unit, so its axis follows the user's pressure unit too.
  const pfAxis = niceAxis(
    Math.max(
      pressureIn(400, pressureUnit),
      ...trend.gases.map((g) => pressureIn(g.pfRatio ?? 0, pressureUnit)),
    ),
  );
  const yPao2 = (mmHg: number) =>
    GASES.top + (1 - pressureIn(mmHg, pressureUnit) / pao2Axis.max) * GASES.height;
  const yPf = (mmHg: number) =>
    GASES.top + (1 - pressureIn(mmHg, pressureUnit) / pfAxis.max) * GASES.height;

  const stepHours = TICK_STEPS_H.find((h) => span / (h * HOUR) <= 8) ?? 168;
  const firstTick = Math.ceil(from / (stepHours * HOUR)) * stepHours * HOUR;
  const timeTicks: number[] = [];
  for (let t = firstTick; t <= to; t += stepHours * HOUR) timeTicks.push(t);

  const moments = useMemo(() => {
    const all = new Set<number>();
    for (const p of trend.spo2) all.add(Date.parse(p.at));
    for (const s of trend.settings) all.add(Date.parse(s.at));
    for (const g of trend.gases) all.add(Date.parse(g.at));
    return [...all].sort((a, b) => a - b);
  }, [trend]);

  const nearestMoment = (t: number): Moment | null => {
    let best: number | null = null;
    for (const m of moments) if (best === null || Math.abs(m - t) < Math.abs(best - t)) best = m;
    return best;
  };

  const onPointerMove = (event: PointerEvent<SVGSVGElement>) => {
    const rect = event.currentTarget.getBoundingClientRect();
    if (rect.width === 0) return;
    const vx = ((event.clientX - rect.left) / rect.width) * W;
    const t = from + ((vx - M.left) / PW) * span;
    setSelected(nearestMoment(t));
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

  const spo2Path = trend.spo2
    .map(
      (p, i) =>
        `${i === 0 ? "M" : "L"}${x(Date.parse(p.at)).toFixed(1)},${ySpo2(p.spo2Pct).toFixed(1)}`,
    )
    .join(" ");
  const showDots = trend.spo2.length <= 150;
  const details = selected === null ? null : trendDetails(trend, selected, pressureUnit);
  const description =
    `SpO2 from ${formatUnitTime(trend.from, trend.timeZone)} to ${formatUnitTime(trend.to, trend.timeZone)}: ` +
    `${trend.spo2Count} ${trend.spo2Count === 1 ? "reading" : "readings"}, ${trend.bands.length} order ${trend.bands.length === 1 ? "period" : "periods"}, ` +
    `${trend.settings.length} settings ${trend.settings.length === 1 ? "step" : "steps"}, ${trend.gases.length} arterial ${trend.gases.length === 1 ? "gas" : "gases"}. The table below lists every value.`;
  const unit = pressureUnit;

  const axisLabel = (text: string, top: number, height: number, side: "left" | "right") => (
    <text
      transform={`translate(${side === "left" ? 12 : W - 8} ${top + height / 2}) rotate(${side === "left" ? -90 : 90})`}
      textAnchor="middle"
      className="fill-ink text-[11px] font-medium"
    >
      {text}
    </text>
  );

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
            {/* SpO2 panel with the target band of each order period. */}
            {spo2Ticks.map((v) => (
              <g key={`s${v}`}>
                <line
                  x1={M.left}
                  x2={M.left + PW}
                  y1={ySpo2(v)}
                  y2={ySpo2(v)}
                  className="stroke-border"
                />
                <text
                  x={M.left - 6}
                  y={ySpo2(v) + 3.5}
                  textAnchor="end"
                  className="tabular fill-ink-muted text-[11px]"
                >
                  {v}
                </text>
              </g>
            ))}
            {axisLabel("SpO2 (%)", SPO2.top, SPO2.height, "left")}
            {trend.bands.map((b) => {
              const bx = x(Date.parse(b.from));
              const bw = Math.max(1, x(Date.parse(b.to)) - bx);
              return (
                <g key={`${b.orderId}-${b.from}`} data-band={`${b.lowerPct}-${b.upperPct}`}>
                  <rect
                    x={bx}
                    width={bw}
                    y={ySpo2(b.upperPct)}
                    height={ySpo2(b.lowerPct) - ySpo2(b.upperPct)}
                    className="fill-in-band-soft"
                  />
                  <line
                    x1={bx}
                    x2={bx + bw}
                    y1={ySpo2(b.upperPct)}
                    y2={ySpo2(b.upperPct)}
                    strokeDasharray="4 3"
                    className="stroke-in-band"
                  />
                  <line
                    x1={bx}
                    x2={bx + bw}
                    y1={ySpo2(b.lowerPct)}
                    y2={ySpo2(b.lowerPct)}
                    strokeDasharray="4 3"
                    className="stroke-in-band"
                  />
                  {bw > 90 ? (
                    <text
                      x={bx + 4}
                      y={ySpo2(b.upperPct) - 4}
                      className="tabular fill-in-band text-[11px] font-medium"
                    >
                      {`Target ${b.lowerPct}–${b.upperPct} %`}
                    </text>
                  ) : null}
                </g>
              );
            })}
            {spo2Path ? (
              <path
                d={spo2Path}
                fill="none"
                strokeWidth="1.75"
                strokeLinejoin="round"
                className="stroke-accent"
              />
            ) : null}
            {trend.spo2.map((p) => {
              const t = Date.parse(p.at);
              const band = bandAt(trend.bands, t);
              const below = band !== undefined && p.spo2Pct < band.lowerPct;
              const px = x(t);
              const py = ySpo2(p.spo2Pct);
              // Below-band readings get a downward triangle, so colour is not the only signal.
              if (below)
                return (
                  <polygon
                    key={p.at}
                    points={`${px - 4.5},${py - 3} ${px + 4.5},${py - 3} ${px},${py + 4.5}`}
                    className="fill-below"
                  />
                );
              return showDots ? (
                <circle key={p.at} cx={px} cy={py} r="2.5" className="fill-accent" />
              ) : null;
            })}
            {trend.spo2.length === 0 ? (
              <text
                x={M.left + PW / 2}
                y={SPO2.top + SPO2.height / 2}
                textAnchor="middle"
                className="fill-ink-muted text-[13px]"
              >
                No SpO2 readings in this range
              </text>
            ) : null}

            {/* Settings panel: FiO2 (left axis) and PEEP or flow (right axis) as steps. */}
            {[0.21, 0.4, 0.6, 0.8, 1].map((v) => (
              <g key={`f${v}`}>
                <line
                  x1={M.left}
                  x2={M.left + PW}
                  y1={yFio2(v)}
                  y2={yFio2(v)}
                  className="stroke-border"
                />
                <text
                  x={M.left - 6}
                  y={yFio2(v) + 3.5}
                  textAnchor="end"
                  className="tabular fill-ink-muted text-[11px]"
                >
                  {v === 1 ? "1.0" : v.toFixed(2)}
                </text>
              </g>
            ))}
            {second
              ? [0, secondMax / 2, secondMax].map((v) => (
                  <text
                    key={`p${v}`}
                    x={M.left + PW + 6}
                    y={ySecond(v) + 3.5}
                    className="tabular fill-ink-muted text-[11px]"
                  >
                    {v}
                  </text>
                ))
              : null}
            {axisLabel("FiO2", SETTINGS.top, SETTINGS.height, "left")}
            {second
              ? axisLabel(
                  second === "peep" ? "PEEP (cmH2O)" : "Flow (L/min)",
                  SETTINGS.top,
                  SETTINGS.height,
                  "right",
                )
              : null}
            <path
              d={stepPath(trend.settings, (s) => s.fio2, x, yFio2, to)}
              fill="none"
              strokeWidth="2"
              className="stroke-ink"
            />
            {second ? (
              <path
                d={stepPath(
                  trend.settings,
                  (s) => (second === "peep" ? s.peepCmH2O : s.flowLMin),
                  x,
                  ySecond,
                  to,
                )}
                fill="none"
                strokeWidth="2"
                strokeDasharray="6 4"
                className="stroke-above"
              />
            ) : null}
            {trend.settings.length === 0 ? (
              <text
                x={M.left + PW / 2}
                y={SETTINGS.top + SETTINGS.height / 2}
                textAnchor="middle"
                className="fill-ink-muted text-[13px]"
              >
                No order or adjustment in this range
              </text>
            ) : null}

            {/* Gases panel: PaO2 (left axis, user's unit) as circles, P/F (right axis) as squares. */}
            {[0, pao2Axis.max / 2, pao2Axis.max].map((v) => (
              <g key={`g${v}`}>
                <line
                  x1={M.left}
                  x2={M.left + PW}
                  y1={GASES.top + (1 - v / pao2Axis.max) * GASES.height}
                  y2={GASES.top + (1 - v / pao2Axis.max) * GASES.height}
                  className="stroke-border"
                />
                <text
                  x={M.left - 6}
                  y={GASES.top + (1 - v / pao2Axis.max) * GASES.height + 3.5}
                  textAnchor="end"
                  className="tabular fill-ink-muted text-[11px]"
                >
                  {Number(v.toFixed(1))}
                </text>
              </g>
            ))}
            {[0, pfAxis.max / 2, pfAxis.max].map((v) => (
              <text
                key={`pf${v}`}
                x={M.left + PW + 6}
                y={GASES.top + (1 - v / pfAxis.max) * GASES.height + 3.5}
                className="tabular fill-ink-muted text-[11px]"
              >
                {Number(v.toFixed(1))}
              </text>
            ))}
            {axisLabel(`PaO2 (${unit})`, GASES.top, GASES.height, "left")}
            {axisLabel(`P/F (${unit})`, GASES.top, GASES.height, "right")}
            {trend.gases.map((g) => (
              <g key={g.at}>
                <circle
                  cx={x(Date.parse(g.at))}
                  cy={yPao2(g.pao2MmHg)}
                  r="4.5"
                  className="fill-accent stroke-surface"
                />
                {g.pfRatio !== null ? (
                  <rect
                    x={x(Date.parse(g.at)) - 4}
                    y={yPf(g.pfRatio) - 4}
                    width="8"
                    height="8"
                    className="fill-surface stroke-ink"
                    strokeWidth="1.5"
                  />
                ) : null}
              </g>
            ))}
            {trend.gases.length === 0 ? (
              <text
                x={M.left + PW / 2}
                y={GASES.top + GASES.height / 2}
                textAnchor="middle"
                className="fill-ink-muted text-[13px]"
              >
                No arterial blood gas in this range
              </text>
            ) : null}

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

      <div
        aria-live="polite"
        data-testid="trend-details"
        className="tabular min-h-[2.75rem] rounded-md border border-border bg-surface-muted px-3 py-2 text-sm"
      >
        {details ? (
          <p className="flex flex-wrap gap-x-4 gap-y-0.5">
            {details.map((line, i) => (
              <span key={i} className={i === 0 ? "font-semibold" : undefined}>
                {line}
              </span>
            ))}
          </p>
        ) : (
          <p className="text-ink-muted">
            Point at the chart, or focus it and use the arrow keys, for the values at a moment.
          </p>
        )}
      </div>

      <figcaption className="flex flex-wrap items-center gap-x-5 gap-y-1 text-xs text-ink-muted">
        <Legend
          swatch={<line x1="1" y1="6" x2="25" y2="6" strokeWidth="2" className="stroke-accent" />}
          label="SpO2"
        />
        <Legend
          swatch={
            <rect
              x="1"
              y="1"
              width="24"
              height="10"
              className="fill-in-band-soft stroke-in-band"
              strokeDasharray="3 2"
            />
          }
          label="Target band of the order"
        />
        <Legend
          swatch={<polygon points="8,3 18,3 13,11" className="fill-below" />}
          label="Below band"
        />
        <Legend
          swatch={
            <path d="M1,9 L12,9 L12,3 L25,3" fill="none" strokeWidth="2" className="stroke-ink" />
          }
          label="FiO2"
        />
        {second ? (
          <Legend
            swatch={
              <path
                d="M1,9 L12,9 L12,3 L25,3"
                fill="none"
                strokeWidth="2"
                strokeDasharray="4 3"
                className="stroke-above"
              />
            }
            label={second === "peep" ? "PEEP" : "Flow"}
          />
        ) : null}
        <Legend
          swatch={<circle cx="13" cy="6" r="4" className="fill-accent" />}
          label={`PaO2 (${unit})`}
        />
        <Legend
          swatch={
            <rect
              x="9"
              y="2"
              width="8"
              height="8"
              className="fill-surface stroke-ink"
              strokeWidth="1.5"
            />
          }
          label="P/F ratio"
        />
        {trend.downsampled ? (
          <span data-testid="trend-downsampled">
            Showing {trend.spo2.length} of {trend.spo2Count} readings: the lowest and highest of
            each time slice, so dips stay visible.
          </span>
        ) : null}
      </figcaption>

      <TrendTable trend={trend} pressureUnit={pressureUnit} />
    </figure>
  );
}

function Legend({ swatch, label }: { swatch: ReactNode; label: string }) {
  return (
    <span className="inline-flex items-center gap-1.5">
      <svg viewBox="0 0 26 12" width="26" height="12" aria-hidden className="shrink-0">
        {swatch}
      </svg>
      {label}
    </span>
  );
}

/** The text equivalent of the drawing: every plotted value, visually hidden. */
function TrendTable({ trend, pressureUnit }: { trend: Trend; pressureUnit: PressureUnit }) {
  const rows: { at: string; what: string; value: string }[] = [
    ...trend.bands.map((b) => ({
      at: b.from,
      what: "Target band",
      value: `${b.lowerPct}–${b.upperPct} % until ${formatUnitTime(b.to, trend.timeZone)}`,
    })),
    ...trend.spo2.map((p) => ({ at: p.at, what: "SpO2", value: `${p.spo2Pct} %` })),
    ...trend.settings.map((s) => ({
      at: s.at,
      what:
        s.cause === "adjustment"
          ? "Adjustment"
          : s.cause === "order"
            ? "Order settings"
            : "Order discontinued",
      value:
        s.fio2 === null
          ? "—"
          : [
              `FiO2 ${fio2Text(s.fio2)}`,
              s.peepCmH2O === null ? null : `PEEP ${s.peepCmH2O} cmH2O`,
              s.flowLMin === null ? null : `flow ${s.flowLMin} L/min`,
            ]
              .filter(Boolean)
              .join(", "),
    })),
    ...trend.gases.map((g) => ({
      at: g.at,
      what: "Arterial gas",
      value: `PaO2 ${formatPressureNumber(g.pao2MmHg, pressureUnit)} ${pressureUnit}${g.pfRatio === null ? "" : `, P/F ${formatPfRatio(g.pfRatio, pressureUnit)}`}`,
    })),
  ].sort((a, b) => Date.parse(a.at) - Date.parse(b.at));
  return (
    <table className="sr-only" data-testid="trend-table">
      <caption>
        Trend values, oldest first
        {trend.downsampled ? " (SpO2 thinned to the lowest and highest of each time slice)" : ""}
      </caption>
      <thead>
        <tr>
          <th scope="col">Time</th>
          <th scope="col">Measure</th>
          <th scope="col">Value</th>
        </tr>
      </thead>
      <tbody>
        {rows.map((r, i) => (
          <tr key={i}>
            <td>{formatUnitTime(r.at, trend.timeZone)}</td>
            <td>{r.what}</td>
            <td>{r.value}</td>
          </tr>
        ))}
      </tbody>
    </table>
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

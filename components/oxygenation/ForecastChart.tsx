"use client";

import { useId } from "react";
import {
  type Fio2Forecast,
  forecastFio2Change,
  type ForecastInput,
  OxygenInputError,
  pressureIn,
  type PressureUnit,
  RANGES,
} from "@/lib/oxygen";
import { formatFio2, formatPressureNumber, niceAxis } from "./format";

export type ModelKey = keyof Fio2Forecast["models"];
type MarkerShape = "circle" | "square" | "triangle";

/** The three forecast models, each told apart by name, dash and marker as well as colour. */
export const MODELS: readonly {
  key: ModelKey;
  label: string;
  short: string;
  dash?: string;
  stroke: string;
  fill: string;
  marker: MarkerShape;
}[] = [
  {
    key: "pf",
    label: "Constant P/F",
    short: "P/F",
    stroke: "stroke-accent",
    fill: "fill-accent",
    marker: "circle",
  },
  {
    key: "alveolarArterialRatio",
    label: "Constant a/A ratio",
    short: "a/A",
    dash: "7 4",
    stroke: "stroke-ink",
    fill: "fill-ink",
    marker: "square",
  },
  {
    key: "shunt",
    label: "Shunt model",
    short: "Shunt",
    dash: "2 3",
    stroke: "stroke-ink-muted",
    fill: "fill-ink-muted",
    marker: "triangle",
  },
];

/** One FiO2 along the chart's x axis with every model's PaO2 (mmHg). */
export interface ForecastSample {
  fio2: number;
  models: Record<ModelKey, number>;
  low: number;
  high: number;
}

/**
 * The forecast at every FiO2 from 0.21 to 1.00 in steps of 0.01. FiO2s the
 * engine refuses (too low to leave alveolar oxygen at this PaCO2) are left out.
 */
export function forecastSamples(baseline: Omit<ForecastInput, "nextFio2">): ForecastSample[] {
  const samples: ForecastSample[] = [];
  for (let percent = RANGES.fio2.min * 100; percent <= RANGES.fio2.max * 100; percent++) {
    const fio2 = percent / 100;
    try {
      const f = forecastFio2Change({ ...baseline, nextFio2: fio2 });
      samples.push({
        fio2,
        models: {
          pf: f.models.pf.pao2,
          alveolarArterialRatio: f.models.alveolarArterialRatio.pao2,
          shunt: f.models.shunt.pao2,
        },
        low: f.range.low.pao2,
        high: f.range.high.pao2,
      });
    } catch (error) {
      if (!(error instanceof OxygenInputError)) throw error;
    }
  }
  return samples;
}

export function Marker({
  shape,
  x,
  y,
  size = 4.5,
  className,
}: {
  shape: MarkerShape;
  x: number;
  y: number;
  size?: number;
  className: string;
}) {
  switch (shape) {
    case "circle":
      return <circle cx={x} cy={y} r={size} className={className} />;
    case "square":
      return (
        <rect x={x - size} y={y - size} width={size * 2} height={size * 2} className={className} />
      );
    case "triangle":
      return (
        <polygon
          points={`${x},${y - size * 1.2} ${x + size * 1.1},${y + size * 0.8} ${x - size * 1.1},${y + size * 0.8}`}
          className={className}
        />
      );
  }
}

/** A legend sample: the model's line style with its marker. */
export function ModelSwatch({ model }: { model: (typeof MODELS)[number] }) {
  return (
    <svg viewBox="0 0 30 12" width="30" height="12" aria-hidden className="shrink-0">
      <line
        x1="1"
        y1="6"
        x2="29"
        y2="6"
        strokeWidth="2"
        strokeDasharray={model.dash}
        className={model.stroke}
      />
      <Marker
        shape={model.marker}
        x={15}
        y={6}
        size={3.5}
        className={`${model.fill} stroke-surface`}
      />
    </svg>
  );
}

const W = 520;
const H = 290;
const M = { left: 50, right: 56, top: 32, bottom: 40 };
const PW = W - M.left - M.right;
const PH = H - M.top - M.bottom;
const X_MIN = RANGES.fio2.min;
const X_MAX = RANGES.fio2.max;
const X_TICKS = [0.21, 0.4, 0.6, 0.8, 1];
const TABLE_FIO2 = [0.21, 0.3, 0.4, 0.5, 0.6, 0.7, 0.8, 0.9, 1];

/**
 * PaO2 against FiO2 for the three models: each a line, their spread shaded as
 * the range, the measured blood gas marked, and at the proposed FiO2 the
 * range low–high as text. A visually hidden table carries the same values.
 */
export function ForecastChart({
  samples,
  measured,
  proposed,
  pressureUnit,
}: {
  samples: ForecastSample[];
  measured: { fio2: number; pao2: number };
  proposed: { fio2: number; forecast: Fio2Forecast } | null;
  pressureUnit: PressureUnit;
}) {
  const id = useId();
  const show = (mmHg: number) => pressureIn(mmHg, pressureUnit);
  const text = (mmHg: number) => formatPressureNumber(mmHg, pressureUnit);
  const highest = Math.max(
    measured.pao2,
    proposed?.forecast.range.high.pao2 ?? 0,
    ...samples.map((s) => s.high),
  );
  const axis = niceAxis(show(highest) * 1.04);
  const x = (fio2: number) => M.left + ((fio2 - X_MIN) / (X_MAX - X_MIN)) * PW;
  const y = (mmHg: number) => M.top + PH - (show(mmHg) / axis.max) * PH;
  const yTicks = Array.from(
    { length: Math.round(axis.max / axis.step) + 1 },
    (_, i) => i * axis.step,
  );

  const path = (values: (s: ForecastSample) => number) =>
    samples
      .map((s, i) => `${i === 0 ? "M" : "L"}${x(s.fio2).toFixed(1)},${y(values(s)).toFixed(1)}`)
      .join(" ");
  const band =
    samples.length > 1
      ? [
          ...samples.map((s) => `${x(s.fio2).toFixed(1)},${y(s.high).toFixed(1)}`),
          ...[...samples].reverse().map((s) => `${x(s.fio2).toFixed(1)},${y(s.low).toFixed(1)}`),
        ].join(" ")
      : "";

  // Line-end labels in the right margin, pushed apart so they never overlap.
  const last = samples[samples.length - 1];
  const endLabels = last
    ? MODELS.map((m) => ({ model: m, y: y(last.models[m.key]) }))
        .sort((a, b) => a.y - b.y)
        .reduce<{ model: (typeof MODELS)[number]; y: number }[]>((placed, label) => {
          const previous = placed[placed.length - 1];
          placed.push({ ...label, y: previous ? Math.max(label.y, previous.y + 12) : label.y });
          return placed;
        }, [])
    : [];

  const unit = pressureUnit;
  const rangeText = proposed
    ? `${text(proposed.forecast.range.low.pao2)}–${text(proposed.forecast.range.high.pao2)} ${unit}`
    : null;
  const description =
    `Forecast PaO2 by three models for FiO2 from 0.21 to 1.00; the measured blood gas is PaO2 ${text(measured.pao2)} ${unit} at FiO2 ${formatFio2(measured.fio2)}.` +
    (proposed && rangeText
      ? ` At the proposed FiO2 ${formatFio2(proposed.fio2)} the models give PaO2 ${rangeText}.`
      : "");
  const tableRows = samples.filter((s) => TABLE_FIO2.some((f) => Math.abs(f - s.fio2) < 1e-9));
  const px = proposed ? x(proposed.fio2) : 0;
  // The range is written above the plot, over the proposed FiO2, kept inside the chart's width.
  const topLabelHalfWidth = 95;
  const topLabelX = Math.min(Math.max(px, M.left + topLabelHalfWidth - 20), W - topLabelHalfWidth);

  return (
    <figure className="min-w-0">
      <svg
        viewBox={`0 0 ${W} ${H}`}
        className="h-auto w-full"
        role="img"
        aria-labelledby={`${id}-title ${id}-desc`}
      >
        <title id={`${id}-title`}>PaO2 forecast against FiO2</title>
        <desc id={`${id}-desc`}>{description}</desc>
        <g aria-hidden>
          {yTicks.map((t) => {
            const ty = M.top + PH - (t / axis.max) * PH;
            return (
              <g key={t}>
                <line
                  x1={M.left}
                  x2={M.left + PW}
                  y1={ty}
                  y2={ty}
                  className="stroke-border"
                  strokeWidth="1"
                />
                <text
                  x={M.left - 6}
                  y={ty + 3.5}
                  textAnchor="end"
                  className="tabular fill-ink-muted text-[11px]"
                >
                  {Number(t.toFixed(2))}
                </text>
              </g>
            );
          })}
          {X_TICKS.map((t) => (
            <g key={t}>
              <line
                x1={x(t)}
                x2={x(t)}
                y1={M.top + PH}
                y2={M.top + PH + 4}
                className="stroke-border-strong"
              />
              <text
                x={x(t)}
                y={M.top + PH + 16}
                textAnchor="middle"
                className="tabular fill-ink-muted text-[11px]"
              >
                {t === 1 ? "1.0" : t.toFixed(2).replace(/0$/, "")}
              </text>
            </g>
          ))}
          <line
            x1={M.left}
            x2={M.left + PW}
            y1={M.top + PH}
            y2={M.top + PH}
            className="stroke-border-strong"
          />
          <text
            x={M.left + PW / 2}
            y={H - 6}
            textAnchor="middle"
            className="fill-ink text-[11px] font-medium"
          >
            FiO2 (fraction)
          </text>
          <text
            transform={`translate(13 ${M.top + PH / 2}) rotate(-90)`}
            textAnchor="middle"
            className="fill-ink text-[11px] font-medium"
          >
            {`PaO2 (${unit})`}
          </text>

          {band ? <polygon points={band} className="fill-accent" opacity="0.2" /> : null}
          {MODELS.map((m) => (
            <path
              key={m.key}
              d={path((s) => s.models[m.key])}
              fill="none"
              strokeWidth="2"
              strokeDasharray={m.dash}
              strokeLinejoin="round"
              className={m.stroke}
            />
          ))}
          {endLabels.map(({ model, y: ly }) => (
            <text key={model.key} x={M.left + PW + 6} y={ly + 3.5} className="fill-ink text-[11px]">
              {model.short}
            </text>
          ))}

          {proposed ? (
            <g>
              <line
                x1={px}
                x2={px}
                y1={M.top}
                y2={M.top + PH}
                strokeDasharray="3 3"
                className="stroke-ink-muted"
              />
              <line
                x1={px}
                x2={px}
                y1={y(proposed.forecast.range.high.pao2)}
                y2={y(proposed.forecast.range.low.pao2)}
                strokeWidth="6"
                strokeLinecap="round"
                className="stroke-accent"
                opacity="0.45"
              />
              {MODELS.map((m) => (
                <Marker
                  key={m.key}
                  shape={m.marker}
                  x={px}
                  y={y(proposed.forecast.models[m.key].pao2)}
                  className={`${m.fill} stroke-surface`}
                />
              ))}
              <text
                x={topLabelX}
                y={M.top - 14}
                textAnchor="middle"
                className="tabular fill-ink text-[12px] font-semibold"
              >
                {`FiO2 ${formatFio2(proposed.fio2)}: PaO2 ${rangeText ?? ""}`}
              </text>
            </g>
          ) : null}

          <circle
            cx={x(measured.fio2)}
            cy={y(measured.pao2)}
            r="5"
            className="fill-surface stroke-ink"
            strokeWidth="2"
          />
          <circle cx={x(measured.fio2)} cy={y(measured.pao2)} r="2" className="fill-ink" />
          <text
            x={x(measured.fio2) + (x(measured.fio2) > M.left + PW * 0.8 ? -8 : 8)}
            y={y(measured.pao2) + 14}
            textAnchor={x(measured.fio2) > M.left + PW * 0.8 ? "end" : "start"}
            className="fill-ink text-[11px]"
          >
            measured
          </text>
        </g>
      </svg>
      {/* A table cannot shrink to the 1 px of sr-only: its box would widen a phone's page. */}
      <div className="sr-only">
        <table>
          <caption>{`Forecast PaO2 (${unit}) by model at each FiO2`}</caption>
          <thead>
            <tr>
              <th scope="col">FiO2</th>
              {MODELS.map((m) => (
                <th key={m.key} scope="col">
                  {m.label}
                </th>
              ))}
              <th scope="col">Range</th>
            </tr>
          </thead>
          <tbody>
            <tr>
              <th scope="row">{`${formatFio2(measured.fio2)} (measured)`}</th>
              <td colSpan={MODELS.length + 1}>{`PaO2 ${text(measured.pao2)} ${unit}`}</td>
            </tr>
            {proposed ? (
              <tr>
                <th scope="row">{`${formatFio2(proposed.fio2)} (proposed)`}</th>
                {MODELS.map((m) => (
                  <td key={m.key}>{text(proposed.forecast.models[m.key].pao2)}</td>
                ))}
                <td>{rangeText}</td>
              </tr>
            ) : null}
            {tableRows.map((s) => (
              <tr key={s.fio2}>
                <th scope="row">{formatFio2(s.fio2)}</th>
                {MODELS.map((m) => (
                  <td key={m.key}>{text(s.models[m.key])}</td>
                ))}
                <td>{`${text(s.low)}–${text(s.high)}`}</td>
              </tr>
            ))}
          </tbody>
        </table>
      </div>
    </figure>
  );
}

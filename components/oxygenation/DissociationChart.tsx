"use client";

import { useId } from "react";
import {
  convertPressure,
  pressureIn,
  type PressureUnit,
  RANGES,
  saturationFromPO2,
} from "@/lib/oxygen";
import { formatNumber, formatPressureNumber, niceAxis } from "./format";

/** A patient's point on the curve: PO2 in mmHg, saturation in %. */
export interface CurvePoint {
  label: string;
  po2: number;
  saturation: number;
  kind: "measured" | "oximetry" | "curve" | "forecast";
}

const W = 520;
const H = 230;
const M = { left: 44, right: 16, top: 12, bottom: 40 };
const PW = W - M.left - M.right;
const PH = H - M.top - M.bottom;
const TABLE_PO2 = [20, 27, 40, 60, 80, 100];

/**
 * The oxyhaemoglobin dissociation curve (Severinghaus 1979, standard curve)
 * with the patient's points and, when given, the forecast's range drawn along
 * the curve. A visually hidden table carries the same values.
 */
export function DissociationChart({
  points,
  forecastRange,
  pressureUnit,
}: {
  points: CurvePoint[];
  forecastRange: { low: number; high: number } | null;
  pressureUnit: PressureUnit;
}) {
  const id = useId();
  const unit = pressureUnit;
  const text = (mmHg: number) => formatPressureNumber(mmHg, unit);
  const highestMmHg = Math.min(
    RANGES.pao2.max,
    Math.max(120, ...points.map((p) => p.po2 * 1.15), (forecastRange?.high ?? 0) * 1.1),
  );
  const axis = niceAxis(pressureIn(highestMmHg, unit));
  const axisMaxMmHg = convertPressure(axis.max, unit, "mmHg");
  const x = (mmHg: number) => M.left + (pressureIn(mmHg, unit) / axis.max) * PW;
  const y = (percent: number) => M.top + PH - (percent / 100) * PH;
  const xTicks = Array.from(
    { length: Math.round(axis.max / axis.step) + 1 },
    (_, i) => i * axis.step,
  );

  const steps = 160;
  const curve = Array.from({ length: steps }, (_, i) => {
    const po2 =
      RANGES.po2.min + ((Math.min(axisMaxMmHg, RANGES.po2.max) - RANGES.po2.min) * i) / (steps - 1);
    return `${i === 0 ? "M" : "L"}${x(po2).toFixed(1)},${y(100 * saturationFromPO2(po2)).toFixed(1)}`;
  }).join(" ");
  const forecastPath = forecastRange
    ? Array.from({ length: 24 }, (_, i) => {
        const po2 = forecastRange.low + ((forecastRange.high - forecastRange.low) * i) / 23;
        return `${i === 0 ? "M" : "L"}${x(po2).toFixed(1)},${y(100 * saturationFromPO2(po2)).toFixed(1)}`;
      }).join(" ")
    : null;

  // One label per kind of point, below the curve (where it is flat near the top), pushed apart.
  const labels: { text: string; x: number; y: number; anchor: "start" | "end" }[] = [];
  const patientPoints = points.filter((p) => p.kind !== "forecast");
  for (const p of patientPoints) {
    const px = x(p.po2);
    const right = px < M.left + PW * 0.7;
    const previous = labels[labels.length - 1];
    const ly = Math.max(y(p.saturation) + 16, previous ? previous.y + 13 : 0);
    labels.push({
      text: p.label,
      x: right ? px + 8 : px - 8,
      y: ly,
      anchor: right ? "start" : "end",
    });
  }
  if (forecastRange) {
    // Up and to the left of the segment's low end the curve leaves open space.
    const lowX = x(forecastRange.low);
    const lowY = y(100 * saturationFromPO2(forecastRange.low));
    const fitsLeft = lowX - 60 > M.left;
    labels.push(
      fitsLeft
        ? { text: "forecast", x: lowX - 9, y: lowY - 4, anchor: "end" }
        : {
            text: "forecast",
            x: x(forecastRange.high) + 9,
            y: y(100 * saturationFromPO2(forecastRange.high)) + 26,
            anchor: "start",
          },
    );
  }

  const description =
    "Standard oxyhaemoglobin dissociation curve with " +
    points
      .map(
        (p) =>
          `${p.label}: PO2 ${text(p.po2)} ${unit}, saturation ${formatNumber(p.saturation, 1)} %`,
      )
      .join("; ") +
    ".";

  return (
    <figure className="min-w-0">
      <svg
        viewBox={`0 0 ${W} ${H}`}
        className="h-auto w-full"
        role="img"
        aria-labelledby={`${id}-title ${id}-desc`}
      >
        <title id={`${id}-title`}>Oxyhaemoglobin dissociation curve</title>
        <desc id={`${id}-desc`}>{description}</desc>
        <g aria-hidden>
          {[0, 25, 50, 75, 100].map((t) => (
            <g key={t}>
              <line x1={M.left} x2={M.left + PW} y1={y(t)} y2={y(t)} className="stroke-border" />
              <text
                x={M.left - 6}
                y={y(t) + 3.5}
                textAnchor="end"
                className="tabular fill-ink-muted text-[11px]"
              >
                {t}
              </text>
            </g>
          ))}
          {xTicks.map((t) => {
            const tx = M.left + (t / axis.max) * PW;
            return (
              <g key={t}>
                <line
                  x1={tx}
                  x2={tx}
                  y1={M.top + PH}
                  y2={M.top + PH + 4}
                  className="stroke-border-strong"
                />
                <text
                  x={tx}
                  y={M.top + PH + 16}
                  textAnchor="middle"
                  className="tabular fill-ink-muted text-[11px]"
                >
                  {Number(t.toFixed(2))}
                </text>
              </g>
            );
          })}
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
            {`PO2 (${unit})`}
          </text>
          <text
            transform={`translate(12 ${M.top + PH / 2}) rotate(-90)`}
            textAnchor="middle"
            className="fill-ink text-[11px] font-medium"
          >
            Saturation (%)
          </text>
          <path d={curve} fill="none" strokeWidth="2" className="stroke-ink-muted" />
          {forecastPath ? (
            <path
              d={forecastPath}
              fill="none"
              strokeWidth="7"
              strokeLinecap="round"
              className="stroke-accent"
              opacity="0.45"
            />
          ) : null}
          {points.map((p, i) => {
            const px = x(p.po2);
            const py = y(p.saturation);
            return p.kind === "forecast" ? (
              <polygon
                key={`${p.kind}-${i}`}
                points={`${px},${py - 5} ${px + 5},${py} ${px},${py + 5} ${px - 5},${py}`}
                className="fill-accent stroke-surface"
              />
            ) : p.kind === "oximetry" ? (
              <circle
                key={`${p.kind}-${i}`}
                cx={px}
                cy={py}
                r="4.5"
                className="fill-surface stroke-accent"
                strokeWidth="2"
              />
            ) : (
              <circle
                key={`${p.kind}-${i}`}
                cx={px}
                cy={py}
                r="4.5"
                className="fill-accent stroke-surface"
              />
            );
          })}
          {labels.map((label) => (
            <text
              key={label.text}
              x={label.x}
              y={label.y}
              textAnchor={label.anchor}
              className="fill-ink text-[11px]"
            >
              {label.text}
            </text>
          ))}
        </g>
      </svg>
      {/* A table cannot shrink to the 1 px of sr-only: its box would widen a phone's page. */}
      <div className="sr-only">
        <table>
          <caption>{`Points on the dissociation curve (PO2 in ${unit}, saturation in %)`}</caption>
          <thead>
            <tr>
              <th scope="col">Point</th>
              <th scope="col">PO2</th>
              <th scope="col">Saturation</th>
            </tr>
          </thead>
          <tbody>
            {points.map((p, i) => (
              <tr key={`${p.kind}-${i}`}>
                <th scope="row">{p.label}</th>
                <td>{`${text(p.po2)} ${unit}`}</td>
                <td>{`${formatNumber(p.saturation, 1)} %`}</td>
              </tr>
            ))}
            {TABLE_PO2.map((po2) => (
              <tr key={po2}>
                <th scope="row">Standard curve</th>
                <td>{`${text(po2)} ${unit}`}</td>
                <td>{`${formatNumber(100 * saturationFromPO2(po2), 1)} %`}</td>
              </tr>
            ))}
          </tbody>
        </table>
      </div>
    </figure>
  );
}

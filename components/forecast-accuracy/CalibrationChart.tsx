"use client";

import {
  CartesianGrid,
  Legend,
  ReferenceLine,
  Scatter,
  ScatterChart,
  Tooltip,
  XAxis,
  YAxis,
} from "recharts";
import type { CalibrationSeries } from "@/lib/forecast-accuracy/report-tables";
import type { ForecastModel } from "@/lib/forecast-accuracy/types";

/** The models told apart by marker as well as colour, in neutral and accent tokens (never the SpO2 state colours). */
const LOOK: Record<ForecastModel, { fill: string; shape: "circle" | "square" | "triangle" }> = {
  pf: { fill: "var(--tm-accent)", shape: "circle" },
  alveolarArterialRatio: { fill: "var(--tm-ink)", shape: "square" },
  shunt: { fill: "var(--tm-ink-muted)", shape: "triangle" },
};

const SIZE = 420;
const tick = { fill: "var(--tm-ink-muted)", fontSize: 11 };

/**
 * Forecast against measured PaO2, one point per pair and model, with the
 * identity line: a point on it was exact, above it the model forecast too
 * high. Recharts, drawn at a fixed size and scaled by CSS as the other report
 * charts; the pairs table beside it gives the same numbers.
 */
export function CalibrationChart({
  series,
  axisMax,
  unit,
  id,
}: {
  series: CalibrationSeries[];
  axisMax: number;
  unit: string;
  id: string;
}) {
  const n = series[0]?.points.length ?? 0;
  const domain: [number, number] = [0, axisMax];
  return (
    <figure
      className="report-chart print-keep max-w-md space-y-1"
      aria-labelledby={`${id}-caption`}
      data-testid="calibration-chart"
    >
      <figcaption id={`${id}-caption`} className="text-sm font-semibold">
        Calibration: forecast against measured PaO2{" "}
        <span className="font-normal text-ink-muted">
          ({unit}; on the dashed identity line a forecast was exact, above it too high; the table of
          checked forecasts gives the same numbers)
        </span>
      </figcaption>
      <ScatterChart
        width={SIZE}
        height={SIZE}
        accessibilityLayer
        title={`Calibration: forecast against measured PaO2, ${unit}`}
        desc={`Scatter plot of ${n} checked forecasts for each of ${series.map((s) => s.label).join(", ")}: measured PaO2 across, the model's forecast up, with the identity line.`}
        margin={{ top: 8, right: 16, bottom: 20, left: 8 }}
      >
        <CartesianGrid stroke="var(--tm-border)" />
        <XAxis
          type="number"
          dataKey="measured"
          name={`Measured PaO2 (${unit})`}
          domain={domain}
          allowDataOverflow
          tick={tick}
          stroke="var(--tm-border-strong)"
          label={{
            value: `Measured PaO2 (${unit})`,
            position: "insideBottom",
            offset: -12,
            fill: "var(--tm-ink-muted)",
            fontSize: 11,
          }}
        />
        <YAxis
          type="number"
          dataKey="predicted"
          name={`Forecast PaO2 (${unit})`}
          domain={domain}
          allowDataOverflow
          width={52}
          tick={tick}
          stroke="var(--tm-border-strong)"
          label={{
            value: `Forecast PaO2 (${unit})`,
            angle: -90,
            position: "insideLeft",
            offset: -2,
            style: { textAnchor: "middle" },
            fill: "var(--tm-ink-muted)",
            fontSize: 11,
          }}
        />
        <ReferenceLine
          segment={[
            { x: 0, y: 0 },
            { x: axisMax, y: axisMax },
          ]}
          stroke="var(--tm-border-strong)"
          strokeDasharray="5 4"
          ifOverflow="hidden"
        />
        <Tooltip
          cursor={{ strokeDasharray: "3 3" }}
          contentStyle={{
            background: "var(--tm-surface)",
            border: "1px solid var(--tm-border-strong)",
            color: "var(--tm-ink)",
            fontSize: 12,
          }}
        />
        <Legend verticalAlign="top" wrapperStyle={{ fontSize: 12, color: "var(--tm-ink)" }} />
        {series.map((s) => (
          <Scatter
            key={s.model}
            name={s.label}
            data={s.points}
            fill={LOOK[s.model].fill}
            shape={LOOK[s.model].shape}
            legendType={LOOK[s.model].shape}
            isAnimationActive={false}
          />
        ))}
      </ScatterChart>
    </figure>
  );
}

"use client";

import { Bar, BarChart, CartesianGrid, Legend, Tooltip, XAxis, YAxis } from "recharts";
import type { ChartSpec, Tone } from "@/lib/reports/tables";

/** Series colours: the theme's SpO2 state tokens for below / in / above, neutral tokens otherwise. */
const FILL: Record<Tone, string> = {
  "in-band": "var(--tm-in-band)",
  below: "var(--tm-below)",
  above: "var(--tm-above)",
  unknown: "var(--tm-border-strong)",
  neutral: "var(--tm-accent)",
};

const WIDTH = 720;
const HEIGHT = 260;

/**
 * One bar chart of a grouped report (Recharts). Its accessibility layer makes
 * the chart one tab stop whose arrow keys walk the bars with the tooltip; the
 * same numbers stand beside it as a table (and its CSV), the chart's text
 * alternative. Drawn at a fixed size and scaled by CSS, so print and narrow
 * screens get the same picture without a resize pass.
 */
export function ReportChart({ spec, id }: { spec: ChartSpec; id: string }) {
  const data = spec.points.map((p) => ({ label: p.label, ...p.values }));
  return (
    <figure className="report-chart print-keep space-y-1" aria-labelledby={`${id}-caption`}>
      <figcaption id={`${id}-caption`} className="text-sm font-semibold">
        {spec.title}{" "}
        <span className="font-normal text-ink-muted">
          ({spec.unit}; the table beside it gives the same numbers)
        </span>
      </figcaption>
      <BarChart
        width={WIDTH}
        height={HEIGHT}
        data={data}
        accessibilityLayer
        title={`${spec.title}, ${spec.unit}`}
        desc={`Bar chart of ${spec.series.map((s) => s.label).join(", ")} for ${data.length} groups; the table beside it lists each value.`}
        margin={{ top: 8, right: 8, bottom: 4, left: 0 }}
      >
        <CartesianGrid stroke="var(--tm-border)" vertical={false} />
        <XAxis
          dataKey="label"
          tick={{ fill: "var(--tm-ink-muted)", fontSize: 11 }}
          stroke="var(--tm-border-strong)"
          interval="preserveStartEnd"
        />
        <YAxis
          tick={{ fill: "var(--tm-ink-muted)", fontSize: 11 }}
          stroke="var(--tm-border-strong)"
          width={44}
          // Shares rounded to 0.1 can stack to 100.1: keep the axis at 0–100 %.
          {...(spec.stacked
            ? { domain: [0, 100], allowDataOverflow: true, ticks: [0, 25, 50, 75, 100] }
            : {})}
        />
        <Tooltip
          cursor={{ fill: "var(--tm-surface-muted)" }}
          contentStyle={{
            background: "var(--tm-surface)",
            border: "1px solid var(--tm-border-strong)",
            color: "var(--tm-ink)",
            fontSize: 12,
          }}
        />
        <Legend wrapperStyle={{ fontSize: 12, color: "var(--tm-ink)" }} />
        {spec.series.map((s) => (
          <Bar
            key={s.key}
            dataKey={s.key}
            name={s.label}
            fill={FILL[s.tone]}
            isAnimationActive={false}
            {...(spec.stacked ? { stackId: "share" } : {})}
          />
        ))}
      </BarChart>
    </figure>
  );
}

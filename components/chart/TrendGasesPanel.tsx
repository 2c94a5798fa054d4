import type { PressureUnit } from "@/lib/oxygen/units";
import type { Trend } from "@/lib/chart/trend";
import { axisLabel } from "./TrendAxisLabel";
import { GASES, M, PW, type TrendScales } from "./trend-geometry";

/** The gases panel: PaO2 and P/F as points, in the user's pressure unit. */
export function TrendGasesPanel({
  trend,
  scales,
  pressureUnit,
}: {
  trend: Trend;
  scales: TrendScales;
  pressureUnit: PressureUnit;
}) {
  const { x, pao2Axis, pfAxis, yPao2, yPf } = scales;
  const unit = pressureUnit;
  return (
    <>
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
    </>
  );
}

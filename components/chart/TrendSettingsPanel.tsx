import type { Trend } from "@/lib/chart/trend";
import { axisLabel } from "./TrendAxisLabel";
import { M, PW, SETTINGS, stepPath, type TrendScales } from "./trend-geometry";

/** The settings panel: FiO2 and PEEP or flow as steps. */
export function TrendSettingsPanel({ trend, scales }: { trend: Trend; scales: TrendScales }) {
  const { to, x, second, secondMax, yFio2, ySecond } = scales;
  return (
    <>
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
    </>
  );
}

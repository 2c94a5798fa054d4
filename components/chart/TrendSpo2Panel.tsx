import type { Trend } from "@/lib/chart/trend";
import { axisLabel } from "./TrendAxisLabel";
import { bandAt, M, PW, SPO2, type TrendScales } from "./trend-geometry";

/** The SpO2 panel: the target band of each order period shaded, the readings as a line and points. */
export function TrendSpo2Panel({ trend, scales }: { trend: Trend; scales: TrendScales }) {
  const { x, ySpo2, spo2Ticks, spo2Path } = scales;
  const showDots = trend.spo2.length <= 150;
  return (
    <>
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
    </>
  );
}

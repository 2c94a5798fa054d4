import type { VentilatorCheckView } from "@/lib/ventilator-checks/queries";
import { formatUnitTime } from "@/lib/time/zone";

// The trend of plateau and driving pressure (cmH2O) and VT per kg of predicted
// body weight over the checks, each against the order's limit, drawn as SVG at
// a fixed size scaled by CSS (no sideways scroll at 390 px), with the same
// numbers in a table beside it.

const W = 600;
const H = 150;
const PAD = { left: 40, right: 12, top: 12, bottom: 22 };

type Series = { label: string; className: string; dash?: string; points: [number, number][] };

function Plot({
  title,
  unit,
  series,
  limits,
  times,
}: {
  title: string;
  unit: string;
  series: Series[];
  limits: { label: string; value: number }[];
  times: [number, number];
}) {
  const values = [
    ...series.flatMap((s) => s.points.map((p) => p[1])),
    ...limits.map((l) => l.value),
  ];
  const lo = Math.floor(Math.min(0, ...values));
  const hi = Math.ceil(Math.max(...values) * 1.1);
  const [t0, t1] = times;
  const x = (t: number) =>
    t1 === t0
      ? (PAD.left + W - PAD.right) / 2
      : PAD.left + ((t - t0) / (t1 - t0)) * (W - PAD.left - PAD.right);
  const y = (v: number) =>
    H - PAD.bottom - ((v - lo) / (hi - lo || 1)) * (H - PAD.top - PAD.bottom);
  return (
    <figure className="min-w-0">
      <figcaption className="mb-1 flex flex-wrap gap-x-3 text-xs text-ink-muted">
        <span className="font-medium text-ink">
          {title} ({unit})
        </span>
        {series.map((s) => (
          <span key={s.label} className="inline-flex items-center gap-1">
            <svg width="16" height="6" aria-hidden="true">
              <line
                x1="0"
                y1="3"
                x2="16"
                y2="3"
                strokeWidth="2"
                strokeDasharray={s.dash}
                className={s.className}
              />
            </svg>
            {s.label}
          </span>
        ))}
        {limits.map((l) => (
          <span key={l.label}>— — {l.label}</span>
        ))}
      </figcaption>
      <svg
        viewBox={`0 0 ${W} ${H}`}
        className="h-auto w-full"
        role="img"
        aria-label={`${title} over the checks; the table below gives the values.`}
      >
        {[lo, hi].map((v) => (
          <g key={v}>
            <line x1={PAD.left} x2={W - PAD.right} y1={y(v)} y2={y(v)} className="stroke-border" />
            <text
              x={PAD.left - 4}
              y={y(v) + 4}
              textAnchor="end"
              className="tabular fill-ink-muted text-[11px]"
            >
              {v}
            </text>
          </g>
        ))}
        {limits.map((l) => (
          <g key={l.label}>
            <line
              x1={PAD.left}
              x2={W - PAD.right}
              y1={y(l.value)}
              y2={y(l.value)}
              strokeDasharray="6 4"
              className="stroke-below"
            />
            <text
              x={W - PAD.right}
              y={y(l.value) - 3}
              textAnchor="end"
              className="tabular fill-below text-[11px]"
            >
              {l.label}
            </text>
          </g>
        ))}
        {series.map((s) => (
          <g key={s.label}>
            <polyline
              fill="none"
              strokeWidth="2"
              strokeDasharray={s.dash}
              className={s.className}
              points={s.points.map(([t, v]) => `${x(t)},${y(v)}`).join(" ")}
            />
            {s.points.map(([t, v]) => (
              <circle
                key={t}
                cx={x(t)}
                cy={y(v)}
                r="3"
                className={s.className.replace("stroke-", "fill-")}
              />
            ))}
          </g>
        ))}
      </svg>
    </figure>
  );
}

export function VentilationTrend({
  checks,
  timeZone,
}: {
  /** Newest first, as read. */
  checks: VentilatorCheckView[];
  timeZone: string;
}) {
  const ordered = [...checks].reverse();
  const latest = checks[0];
  if (!latest) return null;
  const t = (c: VentilatorCheckView) => Date.parse(c.checkedAt);
  const times: [number, number] = [t(ordered[0]!), t(latest)];
  const pts = (pick: (c: VentilatorCheckView) => number | null | undefined): [number, number][] =>
    ordered.flatMap((c) => {
      const v = pick(c);
      return v === null || v === undefined
        ? []
        : [[t(c), Math.round(v * 10) / 10] as [number, number]];
    });
  return (
    <div className="space-y-3" data-testid="ventilation-trend">
      <div className="grid gap-4 lg:grid-cols-2">
        <Plot
          title="Plateau and driving pressure"
          unit="cmH2O"
          times={times}
          series={[
            { label: "Plateau", className: "stroke-accent", points: pts((c) => c.plateau) },
            {
              label: "Driving pressure",
              className: "stroke-ink-muted",
              dash: "4 3",
              points: pts((c) => c.indices.drivingPressure?.value),
            },
          ]}
          limits={[
            {
              label: `plateau limit ${latest.limits.plateauLimit}`,
              value: latest.limits.plateauLimit,
            },
            {
              label: `driving limit ${latest.limits.drivingLimit}`,
              value: latest.limits.drivingLimit,
            },
          ]}
        />
        <Plot
          title="Tidal volume per kg PBW"
          unit="mL/kg"
          times={times}
          series={[
            {
              label: "VT/kg",
              className: "stroke-accent",
              points: pts((c) => c.indices.vtPerKg.value),
            },
          ]}
          limits={[
            { label: `target up to ${latest.limits.vtMaxMlKg}`, value: latest.limits.vtMaxMlKg },
          ]}
        />
      </div>
      <details>
        <summary className="cursor-pointer text-sm font-medium text-accent">
          The checks as a table
        </summary>
        <div className="mt-2 overflow-x-auto">
          <table className="tabular w-full text-left text-sm">
            <thead className="text-xs text-ink-muted">
              <tr>
                <th scope="col" className="py-1 pr-3 font-medium">
                  Time (unit)
                </th>
                <th scope="col" className="py-1 pr-3 font-medium">
                  VT/kg
                </th>
                <th scope="col" className="py-1 pr-3 font-medium">
                  Plateau
                </th>
                <th scope="col" className="py-1 pr-3 font-medium">
                  Driving
                </th>
              </tr>
            </thead>
            <tbody>
              {checks.map((c) => (
                <tr key={c.id} className="border-t border-border">
                  <td className="py-1 pr-3">{formatUnitTime(c.checkedAt, timeZone)}</td>
                  <td className="py-1 pr-3">{c.indices.vtPerKg.value.toFixed(1)}</td>
                  <td className="py-1 pr-3">{c.plateau ?? "—"}</td>
                  <td className="py-1 pr-3">
                    {c.indices.drivingPressure?.value.toFixed(1) ?? "—"}
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      </details>
    </div>
  );
}

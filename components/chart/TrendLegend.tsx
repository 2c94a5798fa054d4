import type { ReactNode } from "react";
import type { PressureUnit } from "@/lib/oxygen/units";
import type { Trend } from "@/lib/chart/trend";

/** The details of the selected moment, announced politely: the chart's tooltip. */
export function TrendDetailsBox({ details }: { details: string[] | null }) {
  return (
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
  );
}

/** The legend under the drawing, with the note when SpO2 is thinned. */
export function TrendLegend({
  trend,
  second,
  pressureUnit,
}: {
  trend: Trend;
  second: "peep" | "flow" | null;
  pressureUnit: PressureUnit;
}) {
  const unit = pressureUnit;
  return (
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
          Showing {trend.spo2.length} of {trend.spo2Count} readings: the lowest and highest of each
          time slice, so dips stay visible.
        </span>
      ) : null}
    </figcaption>
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

import type { Tile, Tone } from "@/lib/reports/tables";

const TONE: Record<Tone, string> = {
  "in-band": "border-in-band/50 bg-in-band-soft text-in-band",
  below: "border-below/50 bg-below-soft text-below",
  above: "border-above/50 bg-above-soft text-above",
  unknown: "border-border bg-surface text-ink-muted",
  neutral: "border-border bg-surface text-ink",
};

/** The headline numbers of a report for the whole unit and period. */
export function SummaryTiles({ tiles, label }: { tiles: Tile[]; label: string }) {
  return (
    <dl
      aria-label={label}
      className="grid grid-cols-2 gap-2 sm:grid-cols-3 lg:grid-cols-6 print:grid-cols-3"
    >
      {tiles.map((t) => (
        <div
          key={t.key}
          data-testid={`tile-${t.key}`}
          className={`print-keep rounded-card border px-3 py-2 shadow-card ${TONE[t.tone]}`}
        >
          <dt className="text-xs font-medium">{t.label}</dt>
          <dd className="text-value">
            {t.value}
            {t.unit && t.value !== "–" ? (
              <span className="ml-1 text-sm font-normal">{t.unit}</span>
            ) : null}
          </dd>
        </div>
      ))}
    </dl>
  );
}

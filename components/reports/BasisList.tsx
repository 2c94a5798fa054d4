import type { MeasureBasis } from "@/lib/reports/types";

/** The basis view: each measure's definition and where it comes from. */
export function BasisList({ basis }: { basis: MeasureBasis[] }) {
  return (
    <details
      className="rounded-card border border-border bg-surface px-3 py-2 print:border-0 print:px-0"
      open
    >
      <summary className="cursor-pointer text-base font-semibold">
        Basis: how each measure is defined
      </summary>
      {basis.length === 0 ? (
        <p className="mt-2 text-sm text-ink-muted">No definitions came with this report.</p>
      ) : (
        <dl className="mt-2 space-y-2 text-sm" data-testid="report-basis">
          {basis.map((b) => (
            <div key={b.key} className="print-keep">
              <dt className="font-semibold">{b.label}</dt>
              <dd>{b.definition}</dd>
              <dd className="text-xs text-ink-muted">Source: {b.source}</dd>
            </div>
          ))}
        </dl>
      )}
    </details>
  );
}

/** The Board's skeleton: the heading, the filters and a table's worth of rows. */
export default function BoardLoading() {
  return (
    <div className="space-y-4" aria-busy="true" aria-live="polite">
      <span className="sr-only">Loading the Board…</span>
      <div className="h-8 w-40 animate-pulse rounded bg-surface-muted" />
      <div className="flex gap-3">
        <div className="h-12 w-40 animate-pulse rounded bg-surface-muted" />
        <div className="h-12 w-40 animate-pulse rounded bg-surface-muted" />
      </div>
      <div className="h-6 w-56 animate-pulse rounded bg-surface-muted" />
      <div className="overflow-hidden rounded-card border border-border bg-surface">
        <div className="h-8 bg-surface-muted" />
        {Array.from({ length: 8 }, (_, i) => (
          <div key={i} className="flex gap-3 border-t border-border px-2 py-3">
            <div className="h-4 w-10 animate-pulse rounded bg-surface-muted" />
            <div className="h-4 w-24 animate-pulse rounded bg-surface-muted" />
            <div className="h-4 flex-1 animate-pulse rounded bg-surface-muted" />
          </div>
        ))}
      </div>
    </div>
  );
}

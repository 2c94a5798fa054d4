/** The Rehearsal page's skeleton: the heading, the form's place and a few runs. */
export default function RehearsalsLoading() {
  return (
    <div className="space-y-4" aria-busy="true" aria-live="polite">
      <span className="sr-only">Loading the rehearsals…</span>
      <h1 className="text-2xl font-semibold tracking-tight">Protocol rehearsal</h1>
      <div className="h-10 w-56 animate-pulse rounded bg-surface-muted" />
      <div className="h-40 animate-pulse rounded-card bg-surface-muted" />
      <div className="overflow-hidden rounded-card border border-border bg-surface">
        {Array.from({ length: 4 }, (_, i) => (
          <div key={i} className="flex gap-3 border-t border-border px-3 py-3 first:border-t-0">
            <div className="h-4 w-4 animate-pulse rounded bg-surface-muted" />
            <div className="h-4 w-48 animate-pulse rounded bg-surface-muted" />
            <div className="h-4 flex-1 animate-pulse rounded bg-surface-muted" />
          </div>
        ))}
      </div>
    </div>
  );
}

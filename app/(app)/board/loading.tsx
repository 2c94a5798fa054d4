export default function BoardLoading() {
  return (
    <div className="space-y-3" aria-busy="true" aria-live="polite">
      <span className="sr-only">Loading the Board…</span>
      <div className="h-8 w-40 animate-pulse rounded bg-surface-muted" />
      {Array.from({ length: 8 }, (_, i) => (
        <div key={i} className="h-9 animate-pulse rounded bg-surface-muted" />
      ))}
    </div>
  );
}

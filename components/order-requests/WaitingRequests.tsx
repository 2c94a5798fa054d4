import Link from "next/link";
import type { OrderRequestView } from "@/lib/order-requests/queries";

/** The Board's panel for a physician: requests waiting for their answer. */
export function WaitingRequests({ requests }: { requests: OrderRequestView[] }) {
  return (
    <section aria-labelledby="waiting-heading" className="space-y-2" data-testid="waiting-requests">
      <h2 id="waiting-heading" className="text-lg font-semibold">
        Order requests waiting for you{" "}
        <span className="font-normal text-ink-muted">({requests.length})</span>
      </h2>
      {requests.length === 0 ? (
        <p className="text-sm text-ink-muted">Nothing is waiting for you.</p>
      ) : (
        <ul className="divide-y divide-border rounded-card border border-border bg-surface shadow-card">
          {requests.map((r) => (
            <li key={r.id} className="flex flex-wrap items-baseline gap-x-3 px-3 py-2 text-sm">
              <Link
                href={`/order-requests?request=${r.id}#request-${r.id}`}
                className="font-medium text-accent underline"
              >
                #{r.id} · {r.unitCode} bed {r.bedLabel}
              </Link>
              <span className="min-w-0 break-words">{r.need}</span>
              <span className="text-ink-muted">
                from {r.requestedBy.name}
                {r.state === "escalated" ? " · unanswered, escalated" : ""}
              </span>
            </li>
          ))}
        </ul>
      )}
    </section>
  );
}

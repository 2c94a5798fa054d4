import Link from "next/link";
import { buttonClasses } from "@/components/ui/Button";
import type { OrderRequestView } from "@/lib/order-requests/queries";
import { OrderRequestCard } from "./OrderRequestCard";

/** The Chart's panel: this patient's latest order requests, and the way to ask for one. */
export function PatientRequests({
  patientId,
  requests,
  canSend,
  canAnswer,
}: {
  patientId: number;
  requests: OrderRequestView[];
  canSend: boolean;
  canAnswer: boolean;
}) {
  const open = requests.some((r) => r.state !== "closed");
  return (
    <section aria-labelledby="requests-heading" className="space-y-2">
      <div className="flex flex-wrap items-center justify-between gap-2">
        <h2 id="requests-heading" className="text-lg font-semibold">
          Order requests
        </h2>
        {canSend && !open ? (
          <Link
            href={`/patients/${patientId}/order-request?from=chart`}
            className={buttonClasses("secondary")}
          >
            Ask for a new order
          </Link>
        ) : null}
      </div>
      {requests.length === 0 ? (
        <p className="text-sm text-ink-muted">No order requests for this stay.</p>
      ) : (
        <ul className="space-y-3">
          {requests.map((r) => (
            <OrderRequestCard key={r.id} request={r} canAnswer={canAnswer} />
          ))}
        </ul>
      )}
    </section>
  );
}

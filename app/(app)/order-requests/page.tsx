import type { Metadata } from "next";
import { z } from "zod";
import { OrderRequestCard } from "@/components/order-requests/OrderRequestCard";
import { EmptyState } from "@/components/ui/EmptyState";
import { pagePermission } from "@/lib/auth/page-guard";
import { can } from "@/lib/auth/permissions";
import { db } from "@/lib/db";
import { listOrderRequests } from "@/lib/order-requests/queries";

export const metadata: Metadata = { title: "Order requests" };

/**
 * The physician's queue (open requests addressed to them first, then the
 * others open on their units) and, for everyone, the recent closed ones: the
 * requester sees theirs close here.
 */
export default async function OrderRequestsPage({
  searchParams,
}: {
  searchParams: Promise<{ request?: string }>;
}) {
  const actor = await pagePermission("record.read");
  const focus = z.coerce
    .number()
    .int()
    .positive()
    .safeParse((await searchParams).request);
  const all = await listOrderRequests(db(), actor, { status: "all", limit: 100 });
  const canAnswer = can(actor, "order_request.answer");
  const mine = all.filter((r) => r.state !== "closed" && r.forMe);
  const open = all.filter((r) => r.state !== "closed" && !r.forMe);
  const closed = all.filter((r) => r.state === "closed").slice(0, 30);
  const section = (title: string, rows: typeof all, empty: string) => (
    <section aria-label={title} className="space-y-2">
      <h2 className="text-lg font-semibold">
        {title} <span className="font-normal text-ink-muted">({rows.length})</span>
      </h2>
      {rows.length === 0 ? (
        <p className="text-sm text-ink-muted">{empty}</p>
      ) : (
        <ul className="space-y-3">
          {rows.map((r) => (
            <OrderRequestCard
              key={r.id}
              request={r}
              canAnswer={canAnswer}
              highlight={focus.success && focus.data === r.id}
            />
          ))}
        </ul>
      )}
    </section>
  );
  return (
    <div className="space-y-5">
      <div>
        <h1 className="text-2xl font-semibold tracking-tight">Order requests</h1>
        <p className="text-sm text-ink-muted">
          Requests for a new order from the bedside. A signed order for the patient closes the
          request; so does an answer with a reason.
        </p>
      </div>
      {all.length === 0 ? (
        <EmptyState title="No order requests on your units">
          A therapist or nurse asks for a new order from a change refused at the limits, from the
          alert “Order limits reached”, or from the Chart.
        </EmptyState>
      ) : (
        <>
          {canAnswer ? section("Waiting for you", mine, "Nothing is waiting for you.") : null}
          {section(
            canAnswer ? "Open on your units" : "Open",
            canAnswer ? open : [...mine, ...open],
            "No request is open.",
          )}
          {section("Closed recently", closed, "None closed yet.")}
        </>
      )}
    </div>
  );
}

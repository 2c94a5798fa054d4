import Link from "next/link";
import { StatusBadge } from "@/components/ui/StatusBadge";
import { buttonClasses } from "@/components/ui/Button";
import type { OrderRequestView } from "@/lib/order-requests/queries";
import { snapshotWords } from "@/lib/order-requests/snapshot";
import { BASIS_LABELS } from "./labels";
import { ReplyForm } from "./ReplyForm";

const STATE = {
  open: { status: "neutral", label: "Waiting" },
  escalated: { status: "escalated", label: "Unanswered — escalated" },
  closed: { status: "in-band", label: "Closed" },
} as const;

const SOURCE_WORDS = {
  limit_refusal: "from a change refused at the limits",
  limits_alert: "from the alert “Order limits reached”",
  chart: "from the Chart",
} as const;

/** 24-hour, with the date: every time in the app is shown like this. */
function at(iso: string): string {
  return new Date(iso).toLocaleString("en-GB", {
    day: "2-digit",
    month: "short",
    hour: "2-digit",
    minute: "2-digit",
    hourCycle: "h23",
  });
}

/** Who was told at one step, each with why. */
function names(told: OrderRequestView["told"][number]): string | null {
  return told.length ? told.map((t) => `${t.name} (${BASIS_LABELS[t.basis]})`).join(", ") : null;
}

/**
 * One order request: where, what is needed and why, the bedside at the time
 * of asking, who was told and how it ended. A physician gets the way to the
 * prefilled composer and the answer form while it is open.
 */
export function OrderRequestCard({
  request: r,
  canAnswer,
  highlight,
}: {
  request: OrderRequestView;
  canAnswer: boolean;
  highlight?: boolean;
}) {
  const s = STATE[r.state];
  return (
    <li
      id={`request-${r.id}`}
      data-testid="order-request"
      className={`space-y-2 rounded-card border bg-surface p-4 shadow-card ${highlight ? "border-accent" : "border-border"}`}
    >
      <div className="flex flex-wrap items-baseline gap-x-3 gap-y-1">
        <h3 className="text-base font-semibold">
          Request #{r.id} · {r.unitCode} bed {r.bedLabel}
        </h3>
        <StatusBadge status={s.status} label={s.label} />
        <Link href={`/patients/${r.patientId}`} className="text-sm text-accent underline">
          {r.patientName}
        </Link>
      </div>
      <dl className="grid gap-x-4 gap-y-1 text-sm sm:grid-cols-[8rem_minmax(0,1fr)]">
        <dt className="text-ink-muted">Needed</dt>
        <dd className="break-words">{r.need}</dd>
        <dt className="text-ink-muted">Why</dt>
        <dd className="break-words">{r.reason}</dd>
        <dt className="text-ink-muted">At the time</dt>
        <dd className="break-words">{snapshotWords(r.snapshot)}</dd>
        <dt className="text-ink-muted">Asked</dt>
        <dd>
          {at(r.createdAt)} by {r.requestedBy.name} {SOURCE_WORDS[r.source]}
        </dd>
        <dt className="text-ink-muted">Told</dt>
        <dd>
          {names(r.told[0] ?? []) ??
            "Nobody could be told: no physician, charge nurse or fallback address."}
        </dd>
        {r.escalatedAt ? (
          <>
            <dt className="text-ink-muted">Escalated</dt>
            <dd>
              {at(r.escalatedAt)}, unanswered, to {names(r.told[1] ?? []) ?? "nobody reachable"}
            </dd>
          </>
        ) : null}
        {r.closedAt ? (
          <>
            <dt className="text-ink-muted">Closed</dt>
            <dd className="break-words" data-testid="request-closed">
              {at(r.closedAt)}, {r.closedWords}
            </dd>
          </>
        ) : null}
      </dl>
      {canAnswer && r.state !== "closed" ? (
        <div className="space-y-2 border-t border-border pt-2">
          <Link
            href={`/patients/${r.patientId}/orders/new?request=${r.id}`}
            className={buttonClasses("primary")}
          >
            Write the order from this request
          </Link>
          <ReplyForm requestId={r.id} />
        </div>
      ) : null}
    </li>
  );
}

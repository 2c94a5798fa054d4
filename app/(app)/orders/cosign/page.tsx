import type { Metadata } from "next";
import Link from "next/link";
import { formatDuration, formatOrderTime } from "@/components/orders/OrderFacts";
import { EmptyState } from "@/components/ui/EmptyState";
import { StatusBadge } from "@/components/ui/StatusBadge";
import { pagePermission } from "@/lib/auth/page-guard";
import { db } from "@/lib/db";
import { mayCosign } from "@/lib/orders/cosigners";
import { DEVICE_PROFILES } from "@/lib/devices";
import { listCosignQueue } from "@/lib/orders/queries";
import { cosignNotices } from "@/lib/orders/cosign-reminders";
import { CosignNoticeLine } from "@/components/orders/CosignNoticeLine";

export const metadata: Metadata = { title: "Co-sign queue" };

const MODE_WORDS = { verbal: "Verbal", telephone: "Telephone", written: "Written" } as const;

/** Verbal and telephone orders in the physician's units waiting for a co-signature, oldest first. */
export default async function CosignQueuePage() {
  const actor = await pagePermission("order.cosign");
  const queue = await listCosignQueue(db(), actor.unitIds);
  const notices = await cosignNotices(
    db(),
    queue.map((o) => o.id),
  );
  const now = new Date();

  return (
    <div className="space-y-4">
      <div>
        <h1 className="text-2xl font-semibold tracking-tight">Co-sign queue</h1>
        <p className="text-sm text-ink-muted">
          Verbal and telephone orders entered by nurses and therapists on your units. Each is in
          effect, marked &ldquo;Awaiting co-sign&rdquo;, until the prescriber it names, or a
          physician the unit designates, co-signs it. Oldest first; you are offered co-signing only
          where you may give it.
        </p>
      </div>
      {queue.length === 0 ? (
        <EmptyState title="Nothing to co-sign">
          No verbal or telephone order on your units is waiting for a co-signature.
        </EmptyState>
      ) : (
        <div className="overflow-x-auto rounded-card border border-border bg-surface shadow-card">
          <table className="w-full text-left text-sm" data-testid="cosign-queue">
            <caption className="sr-only">
              {queue.length} order{queue.length === 1 ? "" : "s"} awaiting co-signature, oldest
              first
            </caption>
            <thead className="border-b border-border bg-surface-muted text-xs tracking-wide text-ink-muted">
              <tr>
                <th scope="col" className="px-3 py-2">
                  Bed
                </th>
                <th scope="col" className="px-3 py-2">
                  Patient
                </th>
                <th scope="col" className="px-3 py-2">
                  Device
                </th>
                <th scope="col" className="px-3 py-2">
                  SpO2 band
                </th>
                <th scope="col" className="px-3 py-2">
                  Entered by
                </th>
                <th scope="col" className="px-3 py-2">
                  Entered
                </th>
                <th scope="col" className="px-3 py-2">
                  Waiting
                </th>
                <th scope="col" className="px-3 py-2">
                  <span className="sr-only">Open</span>
                </th>
              </tr>
            </thead>
            <tbody>
              {queue.map((o) => (
                <tr
                  key={o.id}
                  className="border-b border-border last:border-0"
                  data-testid="cosign-row"
                >
                  <td className="tabular px-3 py-2 font-medium">
                    {o.bedLabel}
                    <span className="ml-1 text-xs text-ink-muted">{o.unitCode}</span>
                  </td>
                  <th scope="row" className="px-3 py-2 font-medium">
                    {o.patientName}
                  </th>
                  <td className="px-3 py-2">{DEVICE_PROFILES[o.device].label}</td>
                  <td className="tabular px-3 py-2">
                    {o.spo2Band.lower}–{o.spo2Band.upper} %
                  </td>
                  <td className="px-3 py-2">
                    {o.enteredBy.name}
                    <span className="block text-xs text-ink-muted">
                      {MODE_WORDS[o.entryMode]} from {o.prescriber.name}
                    </span>
                  </td>
                  <td className="tabular px-3 py-2">{formatOrderTime(o.createdAt, o.timeZone)}</td>
                  <td className="px-3 py-2 whitespace-nowrap">
                    <StatusBadge
                      status={notices.get(o.id)?.escalatedAt ? "escalated" : "overdue"}
                      label={`waiting ${formatDuration(now.getTime() - Date.parse(o.createdAt))}`}
                    />
                    <CosignNoticeLine notices={notices.get(o.id)} timeZone={o.timeZone} />
                  </td>
                  <td className="px-3 py-2 text-right">
                    {mayCosign(actor.id, o.cosigners) ? (
                      <Link
                        href={`/orders/${o.id}`}
                        className="font-medium whitespace-nowrap text-accent underline-offset-2 hover:underline"
                        aria-label={`Review and co-sign order #${o.id} for ${o.patientName}`}
                      >
                        Review and co-sign
                      </Link>
                    ) : (
                      <>
                        <Link
                          href={`/orders/${o.id}`}
                          className="font-medium whitespace-nowrap text-accent underline-offset-2 hover:underline"
                          aria-label={`Review order #${o.id} for ${o.patientName}`}
                        >
                          Review
                        </Link>
                        <span className="block text-xs text-ink-muted">
                          {o.prescriber.name}
                          {o.cosigners.designated.some((p) => p.id !== o.prescriber.id)
                            ? " or a designated co-signer"
                            : ""}{" "}
                          co-signs
                        </span>
                      </>
                    )}
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      )}
    </div>
  );
}

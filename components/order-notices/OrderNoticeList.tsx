"use client";

import Link from "next/link";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { Button } from "@/components/ui/Button";
import { readOrderChangeAction } from "@/lib/order-notices/actions";
import type { OrderNoticeView } from "@/lib/order-notices/queries";

const EVENT_WORDS = {
  new: "New order",
  supersede: "Order changed",
  discontinue: "Order discontinued",
} as const;

/** The caller's order changes not yet read, each with its words and a "Mark as read" button. */
export function OrderNoticeList({ notices }: { notices: OrderNoticeView[] }) {
  const router = useRouter();
  const [busy, setBusy] = useState<number | null>(null);
  const [failure, setFailure] = useState<string | null>(null);
  const read = async (orderId: number) => {
    setBusy(orderId);
    setFailure(null);
    try {
      const result = await readOrderChangeAction({ orderId });
      if (!result.ok) setFailure(result.message);
      else router.refresh();
    } catch {
      setFailure("Tidemark could not be reached; nothing was recorded. Try again.");
    } finally {
      setBusy(null);
    }
  };
  return (
    <section aria-labelledby="notices-heading" className="space-y-2" data-testid="order-notices">
      <h2 id="notices-heading" className="text-lg font-semibold">
        Order changes to read <span className="font-normal text-ink-muted">({notices.length})</span>
      </h2>
      {notices.length === 0 ? (
        <p className="text-sm text-ink-muted">Every order change on your beds has been read.</p>
      ) : (
        <ul className="divide-y divide-border rounded-card border border-border bg-surface shadow-card">
          {notices.map((n) => (
            <li key={n.id} className="space-y-1 px-3 py-2 text-sm">
              <p className="font-medium">
                {EVENT_WORDS[n.event]} ·{" "}
                <Link href={`/patients/${n.patientId}`} className="text-accent underline">
                  {n.unitCode} bed {n.bedLabel}
                </Link>
              </p>
              <p className="break-words">{n.words}</p>
              <Button
                variant="secondary"
                disabled={busy === n.orderId}
                onClick={() => void read(n.orderId)}
              >
                {busy === n.orderId ? "Recording…" : "Mark as read"}
              </Button>
            </li>
          ))}
        </ul>
      )}
      {failure ? (
        <p role="alert" className="text-sm font-medium text-below">
          {failure}
        </p>
      ) : null}
    </section>
  );
}

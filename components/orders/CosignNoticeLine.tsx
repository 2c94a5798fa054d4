import type { CosignNotices } from "@/lib/orders/cosign-reminders";
import { formatOrderTime } from "./OrderFacts";

/** Under an order's age in the co-sign queue: whether its prescriber was reminded, and whether it was escalated. */
export function CosignNoticeLine({
  notices,
  timeZone,
}: {
  notices: CosignNotices | undefined;
  timeZone: string;
}) {
  if (!notices) {
    return <span className="block text-xs text-ink-muted">not yet reminded</span>;
  }
  return (
    <span className="block text-xs text-ink-muted" data-testid="cosign-notices">
      {notices.reminders > 0
        ? `reminded ${notices.reminders}×, last ${formatOrderTime(notices.lastRemindedAt!, timeZone)}`
        : "not reminded"}
      {notices.escalatedAt ? (
        <span className="block font-medium text-ink">
          escalated {formatOrderTime(notices.escalatedAt, timeZone)} to the unit&rsquo;s co-signers
        </span>
      ) : null}
    </span>
  );
}

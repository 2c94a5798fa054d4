"use client";

import Link from "next/link";
import useSWR from "swr";
import { getApiJson } from "@/components/ui/api-json";
import { IconEscalated } from "@/components/ui/icons";
import type { AlertSummary } from "@/lib/alerts/queries";

/** How often the header count refreshes, besides on focus and after an acknowledgement. */
export const ALERT_SUMMARY_REFRESH_MS = 15_000;
export const ALERT_SUMMARY_URL = "/api/v1/alerts/summary";

/**
 * The header's alert count for the user's units: alerts waiting for
 * acknowledgement, in words and with a shape, never colour alone. Quiet when
 * there are none; a failed refresh keeps the last count rather than flashing.
 */
export function AlertBell({ initial }: { initial: AlertSummary }) {
  const { data } = useSWR<AlertSummary, Error>(
    ALERT_SUMMARY_URL,
    (url: string) => getApiJson<AlertSummary>(url, "the alerts"),
    {
      fallbackData: initial,
      refreshInterval: ALERT_SUMMARY_REFRESH_MS,
      revalidateOnFocus: true,
      keepPreviousData: true,
    },
  );
  const s = data ?? initial;
  const waiting = s.unacknowledged;
  const label =
    waiting === 0
      ? s.open === 0
        ? "No open alerts"
        : `${s.open} open, all acknowledged`
      : `${waiting} alert${waiting === 1 ? "" : "s"} to acknowledge${s.urgent ? ", urgent" : ""}`;
  return (
    <Link
      href="/alerts"
      data-testid="alert-bell"
      aria-label={`Alerts: ${label}`}
      className={`inline-flex items-center gap-1.5 rounded-md px-2.5 py-1.5 text-sm font-medium focus-visible:outline-2 focus-visible:outline-offset-2 focus-visible:outline-accent ${
        waiting
          ? "bg-below-soft text-below"
          : "text-ink-muted hover:bg-surface-muted hover:text-ink"
      }`}
    >
      <IconEscalated className="shrink-0" />
      <span>Alerts</span>
      <span
        className={`tabular min-w-5 rounded-full px-1.5 text-center text-xs ${waiting ? "bg-below text-surface" : "bg-surface-muted"}`}
        aria-hidden="true"
      >
        {waiting}
      </span>
    </Link>
  );
}

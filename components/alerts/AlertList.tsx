"use client";

import Link from "next/link";
import { useEffect } from "react";
import useSWR from "swr";
import { getApiJson } from "@/components/ui/api-json";
import { EmptyState } from "@/components/ui/EmptyState";
import { LoadError } from "@/components/ui/LoadError";
import { StatusBadge, type Status } from "@/components/ui/StatusBadge";
import { describeAlert, type AlertEmailInput } from "@/lib/alerts/email";
import {
  ALERT_KIND_LABELS,
  ALERT_STATE_LABELS,
  ESCALATION_DUTIES,
  ESCALATION_LABELS,
} from "@/lib/alerts/kinds";
import type { AlertView } from "@/lib/alerts/queries";
import { formatUnitTime as at } from "@/components/bedside/BedsideFormParts";
import { AlertActions } from "./AlertActions";

export const ALERT_LIST_REFRESH_MS = 15_000;

const BASIS_WORDS: Record<string, (duty: string) => string> = {
  assigned: (duty) => `assigned ${duty}`,
  prescriber: () => "the order's prescriber — no physician assigned",
  charge: (duty) => `charge nurse — no ${duty} assigned to this bed`,
  fallback: (duty) => `unit fallback address — no ${duty} and no charge nurse on this shift`,
};

type ToldDetail = {
  level: number;
  recipients: { name: string; basis: string; duty?: string }[];
};

/** The people (or address) this level reached, each with the reason they were chosen. */
function toldWho(a: AlertView): string | null {
  const told = a.detail.told as ToldDetail | undefined;
  if (!told || told.level !== a.escalationLevel || !told.recipients.length) return null;
  const duty = ESCALATION_DUTIES[a.escalationLevel] ?? "care team";
  return told.recipients
    .map((r) => `${r.name} (${BASIS_WORDS[r.basis]?.(r.duty ?? duty) ?? r.basis})`)
    .join(", ");
}

/** Who has been told at the current level, why, and whether their e-mail went out. */
function toldText(a: AlertView): string {
  const level = toldWho(a) ?? ESCALATION_LABELS[a.escalationLevel] ?? "care team";
  if (a.detail.unassignedLevel === a.escalationLevel)
    return `nobody: no ${ESCALATION_DUTIES[a.escalationLevel]} assigned, no charge nurse and no fallback address for this unit${a.nextEscalationAt ? " — it escalates unless acknowledged" : ""}`;
  // The current level's e-mail went out after the alert reached that level.
  const since = a.escalatedAt ?? a.openedAt;
  if (a.lastMailAt && a.lastMailAt >= since)
    return `${level} (e-mail ${at(a.lastMailAt, a.unit.timeZone)})`;
  return `${level} — e-mail not yet delivered`;
}

function statusOf(a: AlertView): { status: Status; label: string } {
  if (a.state === "resolved") return { status: "in-band", label: "Resolved" };
  if (a.state === "acknowledged") return { status: "neutral", label: "Acknowledged" };
  if (a.kind === "reassessment_overdue")
    return { status: "overdue", label: ALERT_STATE_LABELS[a.state] };
  if (a.state === "escalated")
    return {
      status: "escalated",
      label: `Escalated to the ${ESCALATION_LABELS[a.escalationLevel]}`,
    };
  // No signal is "no data", not a side of the band.
  if (a.kind === "signal_loss") return { status: "overdue", label: ALERT_STATE_LABELS[a.state] };
  return {
    status:
      a.kind === "above_band" || a.kind === "pao2_above_band" || a.kind === "lung_protection"
        ? "above"
        : "below",
    label: ALERT_STATE_LABELS[a.state],
  };
}

/**
 * The alerts of the user's units, refreshed every 15 s. Each card says what
 * was missed, since when, who has been told, and offers acknowledge / close to
 * the bedside roles.
 */
export function AlertList({
  initial,
  apiUrl,
  canAct,
  focusId,
  compactEmpty,
  canRequest,
}: {
  initial: AlertView[];
  apiUrl: string;
  canAct: boolean;
  /** The user may ask for a new order from an "order limits reached" alert. */
  canRequest?: boolean;
  focusId?: number;
  /** A one-line empty state (the Chart) instead of the full one. */
  compactEmpty?: string;
}) {
  const { data, error, mutate, isValidating } = useSWR<{ alerts: AlertView[] }, Error>(
    apiUrl,
    (url: string) => getApiJson<{ alerts: AlertView[] }>(url, "the alerts"),
    {
      fallbackData: { alerts: initial },
      refreshInterval: ALERT_LIST_REFRESH_MS,
      revalidateOnMount: false,
      keepPreviousData: true,
    },
  );
  const alerts = data?.alerts ?? initial;
  // Arriving from an e-mail link: bring that alert into view once.
  useEffect(() => {
    if (focusId) document.getElementById(`alert-${focusId}`)?.scrollIntoView({ block: "center" });
  }, [focusId]);

  return (
    <div className="space-y-3">
      {error ? (
        <LoadError what="the alerts" message={error.message} onRetry={() => void mutate()} />
      ) : null}
      <p className="sr-only" aria-live="polite">
        {isValidating
          ? "Refreshing alerts"
          : `${alerts.length} ${alerts.length === 1 ? "alert" : "alerts"} shown`}
      </p>
      {alerts.length === 0 && compactEmpty ? (
        <p className="text-sm text-ink-muted">{compactEmpty}</p>
      ) : alerts.length === 0 ? (
        <EmptyState title="No alerts match">
          Nothing to act on for these filters. Alerts open when SpO2 leaves the target band, when
          the order&apos;s limits are reached, or when a reassessment is overdue.
        </EmptyState>
      ) : (
        <ul className="space-y-3">
          {alerts.map((a) => {
            const s = statusOf(a);
            const tz = a.unit.timeZone;
            const spotCheck = a.detail.spotCheck as { spo2: number; at: string } | undefined;
            return (
              <li
                key={a.id}
                id={`alert-${a.id}`}
                data-testid="alert-card"
                className={`rounded-card border bg-surface p-4 shadow-card ${
                  focusId === a.id ? "border-accent" : "border-border"
                }`}
              >
                <div className="flex flex-wrap items-baseline gap-x-3 gap-y-1">
                  <h2 className="text-base font-semibold">
                    {ALERT_KIND_LABELS[a.kind]}
                    {a.grade === "urgent" ? (
                      <span className="ml-2 text-below">· urgent</span>
                    ) : null}
                  </h2>
                  <StatusBadge status={s.status} label={s.label} />
                  <span className="text-sm text-ink-muted">
                    {a.unit.code} bed {a.bed.label} ·{" "}
                    <Link
                      href={`/patients/${a.patient.id}`}
                      className="text-accent underline underline-offset-2"
                    >
                      {a.patient.name}
                    </Link>{" "}
                    <span className="tabular">({a.patient.mrn})</span>
                  </span>
                </div>
                <p className="mt-1 text-sm">
                  {describeAlert({
                    kind: a.kind,
                    band: a.band,
                    spo2: a.worstSpo2 ?? a.triggerSpo2,
                    limitsAtMax: a.detail.limitsAtMax as string[] | undefined,
                    overdueMinutes: a.detail.overdueMinutes as number | undefined,
                    excursion: a.detail.excursion as AlertEmailInput["excursion"],
                    pao2: a.detail.pao2 as number | undefined,
                    pao2Band: a.detail.pao2Band as AlertEmailInput["pao2Band"],
                    breaches: a.detail.breaches as string[] | undefined,
                    ...(typeof a.detail.lastSampleAt === "string"
                      ? { lastSampleText: at(a.detail.lastSampleAt, tz) }
                      : {}),
                  })}
                </p>
                <dl className="mt-2 grid grid-cols-[auto_1fr] gap-x-3 gap-y-0.5 text-xs text-ink-muted sm:grid-cols-[auto_1fr_auto_1fr]">
                  <dt>Since</dt>
                  <dd className="tabular">
                    {at(a.startedAt, tz)} ({tz})
                  </dd>
                  <dt>Opened</dt>
                  <dd className="tabular">{at(a.openedAt, tz)}</dd>
                  <dt>Notified</dt>
                  <dd>{toldText(a)}</dd>
                  {a.nextEscalationAt ? (
                    <>
                      <dt>Escalates</dt>
                      <dd className="tabular">
                        at {at(a.nextEscalationAt, tz)} unless acknowledged
                      </dd>
                    </>
                  ) : null}
                  {a.acknowledged ? (
                    <>
                      <dt>Acknowledged</dt>
                      <dd>
                        {a.acknowledged.by}, {at(a.acknowledged.at, tz)}
                        {a.acknowledged.note ? ` — “${a.acknowledged.note}”` : ""}
                      </dd>
                    </>
                  ) : null}
                  {spotCheck ? (
                    <>
                      <dt>Spot check</dt>
                      <dd>
                        SpO2 {spotCheck.spo2} % charted at {at(spotCheck.at, tz)}, in band — the
                        monitor confirmed this alert, so only the monitor back in band or a
                        clinician&apos;s close ends it.
                      </dd>
                    </>
                  ) : null}
                  {a.resolved ? (
                    <>
                      <dt>Resolved</dt>
                      <dd>
                        {at(a.resolved.at, tz)} — {a.resolved.by ?? "by detection"}
                        {a.resolved.reason ? `: ${a.resolved.reason}` : ""}
                      </dd>
                    </>
                  ) : null}
                </dl>
                {canRequest && a.kind === "limits_exhausted" && a.state !== "resolved" ? (
                  <Link
                    href={`/patients/${a.patient.id}/order-request?from=alert&alertId=${a.id}`}
                    className="mt-2 inline-block text-sm font-medium text-accent underline underline-offset-2"
                  >
                    Ask for a new order
                  </Link>
                ) : null}
                {canAct && a.state !== "resolved" ? (
                  <AlertActions
                    alertId={a.id}
                    canAcknowledge={a.state !== "acknowledged"}
                    suggestedReason={
                      spotCheck
                        ? `Spot check in band: SpO2 ${spotCheck.spo2} % at ${at(spotCheck.at, tz)}.`
                        : undefined
                    }
                    onDone={() => void mutate()}
                  />
                ) : null}
              </li>
            );
          })}
        </ul>
      )}
    </div>
  );
}

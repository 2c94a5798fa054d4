import type { Metadata } from "next";
import { AlertList } from "@/components/alerts/AlertList";
import { EmailPreferencesForm } from "@/components/alerts/EmailPreferencesForm";
import { buttonClasses } from "@/components/ui/Button";
import { Caution } from "@/components/ui/Caution";
import { inputClasses } from "@/components/ui/Field";
import { ALERT_KINDS, ALERT_KIND_LABELS } from "@/lib/alerts/kinds";
import { getEmailPreferences, listAlerts } from "@/lib/alerts/queries";
import { alertFilterSchema } from "@/lib/alerts/schema";
import { pageActor } from "@/lib/auth/page-guard";
import { can } from "@/lib/auth/permissions";
import { db } from "@/lib/db";
import { listUnits } from "@/lib/units/queries";

export const metadata: Metadata = { title: "Alerts" };

const STATUS_OPTIONS = [
  { value: "open", label: "Open (not resolved)" },
  { value: "unacknowledged", label: "Waiting for acknowledgement" },
  { value: "resolved", label: "Resolved" },
  { value: "all", label: "All" },
] as const;

/**
 * Alerts of the user's units: filters in the address (so a link from an
 * e-mail or the Board lands on the right view), the list refreshing itself,
 * and the user's own e-mail choices.
 */
export default async function AlertsPage({
  searchParams,
}: {
  searchParams: Promise<Record<string, string | string[] | undefined>>;
}) {
  const actor = await pageActor();
  const raw = await searchParams;
  const first = (v: string | string[] | undefined) => (Array.isArray(v) ? v[0] : v) || undefined;
  const parsed = alertFilterSchema.safeParse({
    status: first(raw.status),
    kind: first(raw.kind),
    unitId: first(raw.unitId),
    patientId: first(raw.patientId),
    alertId: first(raw.alert),
  });
  // A mangled address falls back to the default view rather than an error page.
  const filter = parsed.success ? parsed.data : alertFilterSchema.parse({});
  // From an alert e-mail: that alert alone, whatever its state now.
  const focus = filter.alertId;
  if (focus) filter.status = "all";
  const [alerts, units, prefs] = await Promise.all([
    listAlerts(db(), actor, filter),
    listUnits(db(), actor.unitIds),
    getEmailPreferences(db(), actor.id),
  ]);
  const query = new URLSearchParams({ status: filter.status, limit: String(filter.limit) });
  if (filter.kind) query.set("kind", filter.kind);
  if (filter.unitId) query.set("unitId", String(filter.unitId));
  if (filter.patientId) query.set("patientId", String(filter.patientId));
  if (filter.alertId) query.set("alertId", String(filter.alertId));
  const canAct = can(actor, "alert.act");

  return (
    <div className="space-y-4">
      <div className="flex flex-wrap items-baseline justify-between gap-2">
        <h1 className="text-2xl font-semibold tracking-tight">Alerts</h1>
        <p className="text-sm text-ink-muted">
          {units.map((u) => u.code).join(", ") || "No units"} · the shift&apos;s care team is told
          first; unacknowledged alerts escalate to the therapist, then the physician.
        </p>
      </div>

      <form
        method="get"
        className="flex flex-wrap items-end gap-3 rounded-card border border-border bg-surface p-3"
        aria-label="Filter alerts"
      >
        <label className="flex flex-col gap-1 text-sm font-medium">
          Status
          <select name="status" defaultValue={filter.status} className={inputClasses}>
            {STATUS_OPTIONS.map((o) => (
              <option key={o.value} value={o.value}>
                {o.label}
              </option>
            ))}
          </select>
        </label>
        <label className="flex flex-col gap-1 text-sm font-medium">
          Kind
          <select name="kind" defaultValue={filter.kind ?? ""} className={inputClasses}>
            <option value="">All kinds</option>
            {ALERT_KINDS.map((k) => (
              <option key={k} value={k}>
                {ALERT_KIND_LABELS[k]}
              </option>
            ))}
          </select>
        </label>
        {units.length > 1 ? (
          <label className="flex flex-col gap-1 text-sm font-medium">
            Unit
            <select
              name="unitId"
              defaultValue={filter.unitId ? String(filter.unitId) : ""}
              className={inputClasses}
            >
              <option value="">All my units</option>
              {units.map((u) => (
                <option key={u.id} value={u.id}>
                  {u.code} — {u.name}
                </option>
              ))}
            </select>
          </label>
        ) : null}
        {filter.patientId ? (
          <input type="hidden" name="patientId" value={filter.patientId} />
        ) : null}
        <button type="submit" className={buttonClasses("secondary")}>
          Show
        </button>
        {filter.patientId || focus ? (
          <a href="/alerts" className="text-sm text-accent underline underline-offset-2">
            {focus ? "Show all alerts" : "Show every patient"}
          </a>
        ) : null}
      </form>

      <AlertList
        key={query.toString() + (focus ?? "")}
        initial={alerts}
        apiUrl={`/api/v1/alerts?${query.toString()}`}
        canAct={canAct}
        canRequest={can(actor, "order_request.send")}
        focusId={focus}
      />

      <section
        aria-labelledby="email-prefs"
        className="rounded-card border border-border bg-surface p-4"
      >
        <h2 id="email-prefs" className="mb-2 text-base font-semibold">
          My alert e-mails
        </h2>
        <EmailPreferencesForm initial={prefs} email={actor.email} />
      </section>
      <Caution compact />
    </div>
  );
}

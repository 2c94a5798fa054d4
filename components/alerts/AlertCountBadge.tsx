import Link from "next/link";
import { StatusBadge } from "@/components/ui/StatusBadge";
import type { AdmissionAlerts } from "@/lib/alerts/queries";
import { ALERT_KIND_LABELS } from "@/lib/alerts/kinds";

/**
 * A patient's unresolved alerts in one badge (Board row, Chart header): the
 * count and whether any still waits for acknowledgement, in words as well as
 * colour. Links to the alerts page filtered to the patient.
 */
export function AlertCountBadge({
  alerts,
  patientId,
}: {
  alerts: AdmissionAlerts | null;
  patientId: number;
}) {
  if (!alerts)
    return (
      <span className="text-ink-muted" aria-label="No open alerts">
        —
      </span>
    );
  const waiting = alerts.unacknowledged;
  const label = waiting
    ? `${waiting} to acknowledge${alerts.urgent ? " · urgent" : ""}`
    : `${alerts.open} acknowledged`;
  return (
    <Link
      href={`/alerts?patientId=${patientId}`}
      className="rounded-full focus-visible:outline-2 focus-visible:outline-offset-2 focus-visible:outline-accent"
      title={alerts.kinds.map((k) => ALERT_KIND_LABELS[k]).join("; ")}
      data-testid="alert-count"
    >
      <StatusBadge status={waiting ? "escalated" : "neutral"} label={label} />
    </Link>
  );
}

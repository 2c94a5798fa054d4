import Link from "next/link";
import { buttonClasses } from "@/components/ui/Button";
import { Caution } from "@/components/ui/Caution";
import { EmptyState } from "@/components/ui/EmptyState";
import { spo2Status } from "@/components/adjustments/BedsideContextCards";
import { Spo2Value } from "@/components/readings/Spo2Value";
import { StatusBadge } from "@/components/ui/StatusBadge";
import type { Actor } from "@/lib/auth/actor";
import { can, mayAdjustDevice } from "@/lib/auth/permissions";
import { DEVICE_PROFILES } from "@/lib/devices";
import { formatPfRatio, formatPressure } from "@/lib/oxygen";
import type { BedsideContext } from "@/lib/chart/bedside";

function minutesSince(iso: string, now: Date): number {
  return Math.max(0, Math.round((now.getTime() - Date.parse(iso)) / 60_000));
}

/** What each role may do from the Chart (DEVELOPERS.md, "Roles"). */
export function bedsideActions(actor: Actor, context: BedsideContext) {
  const base = `/patients/${context.admission.patientId}`;
  const actions: { href: string; label: string }[] = [];
  // A discharged patient's Chart is a record: nothing more is written to it.
  if (context.admission.dischargedAt) return actions;
  // Which buttons to show comes from the permission table, as the server's checks do.
  if (can(actor, "order.write")) {
    actions.push({
      href: `${base}/orders/new`,
      label: actor.role === "physician" ? "Write order" : "Enter verbal order",
    });
  }
  if (context.order && mayAdjustDevice(actor, DEVICE_PROFILES[context.order.device])) {
    actions.push({ href: `${base}/adjustments/new`, label: "Record adjustment" });
  }
  if (can(actor, "reading.chart"))
    actions.push({ href: `${base}/readings/new`, label: "Chart SpO2" });
  if (can(actor, "blood_gas.record"))
    actions.push({ href: `${base}/blood-gases/new`, label: "Enter blood gas" });
  return actions;
}

/** The Chart's status summary: order in effect, applied settings, latest observations, proposal. */
export function BedsideSummary({
  actor,
  context,
  now,
}: {
  actor: Actor;
  context: BedsideContext;
  now: Date;
}) {
  const { order, settings, latestReading, latestBloodGas, proposal } = context;
  const actions = bedsideActions(actor, context);
  const sinceReassess = settings ? minutesSince(settings.lastReassessedAt, now) : null;
  const overdue = order && sinceReassess !== null && sinceReassess > order.reassessMinutes;
  return (
    <section aria-labelledby="bedside-heading" className="space-y-3">
      <div className="flex flex-wrap items-center justify-between gap-2">
        <h2 id="bedside-heading" className="text-lg font-semibold">
          Oxygen now
        </h2>
        {actions.length > 0 ? (
          <nav aria-label="Bedside actions" className="flex flex-wrap gap-2">
            {actions.map((a) => (
              <Link key={a.href} href={a.href} className={buttonClasses("secondary")}>
                {a.label}
              </Link>
            ))}
          </nav>
        ) : null}
      </div>
      {!order && context.admission.dischargedAt ? (
        <EmptyState title="Discharged: no order in effect">
          The order of the stay was discontinued at discharge; its history is in the timeline below
          and in the ledger.
        </EmptyState>
      ) : !order ? (
        <EmptyState title="No oxygen order in effect">
          A physician writes the order (device, SpO2 target band, limits). Until then settings
          cannot be changed in Tidemark; readings and blood gases can still be charted.
        </EmptyState>
      ) : (
        <div className="grid gap-3 md:grid-cols-3" data-testid="bedside-summary">
          <div className="rounded-card border border-border bg-surface p-4 shadow-card">
            <div className="flex flex-wrap items-center gap-2">
              <h3 className="text-sm font-semibold">Order #{order.id}</h3>
              {order.status === "awaiting_cosign" ? (
                <StatusBadge status="overdue" label="Awaiting co-sign" />
              ) : (
                <StatusBadge status="in-band" label="Active" />
              )}
            </div>
            <dl className="mt-2 grid grid-cols-[auto_1fr] gap-x-3 gap-y-1 text-sm">
              <dt className="text-ink-muted">Device</dt>
              <dd>{DEVICE_PROFILES[order.device].label}</dd>
              <dt className="text-ink-muted">SpO2 band</dt>
              <dd className="tabular">
                {order.spo2Band.lower}–{order.spo2Band.upper} %
              </dd>
              <dt className="text-ink-muted">FiO2 limits</dt>
              <dd className="tabular">
                {order.limits.fio2Min.toFixed(2)}–{order.limits.fio2Max.toFixed(2)}
              </dd>
              {order.limits.peepMin !== null ? (
                <>
                  <dt className="text-ink-muted">PEEP limits</dt>
                  <dd className="tabular">
                    {order.limits.peepMin}–{order.limits.peepMax} cmH2O
                  </dd>
                </>
              ) : null}
              {order.limits.flowMin !== null ? (
                <>
                  <dt className="text-ink-muted">Flow limits</dt>
                  <dd className="tabular">
                    {order.limits.flowMin}–{order.limits.flowMax} L/min
                  </dd>
                </>
              ) : null}
              <dt className="text-ink-muted">Prescriber</dt>
              <dd>{order.prescriber.name}</dd>
              <dt className="text-ink-muted">Rationale</dt>
              <dd>{order.rationale}</dd>
            </dl>
            <Link
              href={`/orders/${order.id}`}
              className="mt-2 inline-block text-sm text-accent underline-offset-2 hover:underline"
            >
              Order details and history
            </Link>
          </div>
          <div className="rounded-card border border-border bg-surface p-4 shadow-card">
            <h3 className="text-sm font-semibold">Applied settings</h3>
            {settings ? (
              <dl className="mt-2 grid grid-cols-[auto_1fr] gap-x-3 gap-y-1 text-sm">
                <dt className="text-ink-muted">FiO2</dt>
                <dd className="tabular">
                  {settings.fio2.toFixed(2)}
                  {settings.fio2Estimated ? (
                    <span className="ml-1 text-xs text-ink-muted">(estimated)</span>
                  ) : null}
                </dd>
                {settings.peep !== null ? (
                  <>
                    <dt className="text-ink-muted">PEEP</dt>
                    <dd className="tabular">{settings.peep} cmH2O</dd>
                  </>
                ) : null}
                {settings.flow !== null ? (
                  <>
                    <dt className="text-ink-muted">Flow</dt>
                    <dd className="tabular">{settings.flow} L/min</dd>
                  </>
                ) : null}
                <dt className="text-ink-muted">Reassessed</dt>
                <dd className="tabular flex flex-wrap items-center gap-1">
                  {sinceReassess} min ago
                  {overdue ? (
                    <StatusBadge
                      status="overdue"
                      label={`Overdue (every ${order.reassessMinutes} min)`}
                    />
                  ) : null}
                </dd>
              </dl>
            ) : (
              <p className="mt-2 text-sm text-ink-muted">No settings applied yet.</p>
            )}
          </div>
          <div className="rounded-card border border-border bg-surface p-4 shadow-card">
            <h3 className="text-sm font-semibold">Latest observations</h3>
            <dl className="mt-2 grid grid-cols-[auto_1fr] gap-x-3 gap-y-1 text-sm">
              <dt className="text-ink-muted">SpO2</dt>
              <dd className="tabular flex flex-wrap items-center gap-1">
                {latestReading ? (
                  <>
                    {/* One flex item, so it reads as one line: "93 % · 4 min ago". */}
                    <span>
                      <Spo2Value pct={latestReading.spo2} /> ·{" "}
                      {minutesSince(latestReading.takenAt, now)} min ago
                    </span>
                    <StatusBadge
                      status={spo2Status(latestReading.spo2, order.spo2Band, latestReading)}
                    />
                  </>
                ) : (
                  <span className="text-ink-muted">No reading yet</span>
                )}
              </dd>
              <dt className="text-ink-muted">Blood gas</dt>
              <dd className="tabular">
                {latestBloodGas ? (
                  <>
                    PaO2 {formatPressure(latestBloodGas.pao2, actor.pressureUnit)}
                    {latestBloodGas.pfRatio !== null
                      ? `, P/F ${formatPfRatio(latestBloodGas.pfRatio, actor.pressureUnit)}`
                      : ""}
                    {latestBloodGas.fio2Estimated ? (
                      <span className="ml-1 text-xs text-ink-muted">(estimated FiO2)</span>
                    ) : null}
                  </>
                ) : (
                  <span className="text-ink-muted">No blood gas yet</span>
                )}
              </dd>
            </dl>
            {proposal ? (
              <div className="mt-3 rounded-md bg-accent-soft p-2 text-sm" data-testid="proposal">
                <p className="font-medium">
                  Proposal:{" "}
                  {proposal.direction === "up"
                    ? "step up"
                    : proposal.direction === "down"
                      ? "step down"
                      : proposal.direction}
                  {proposal.step
                    ? ` to FiO2 ${proposal.step.fio2.toFixed(2)}${proposal.step.peep !== undefined ? `, PEEP ${proposal.step.peep}` : ""}`
                    : ""}
                </p>
                <p className="text-ink-muted">{proposal.reason}</p>
              </div>
            ) : null}
            {context.proposalError ? (
              <p className="mt-2 text-xs text-below">{context.proposalError}</p>
            ) : null}
          </div>
        </div>
      )}
      {proposal ? <Caution compact /> : null}
    </section>
  );
}

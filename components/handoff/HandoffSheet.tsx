import type { ReactNode } from "react";
import { Caution } from "@/components/ui/Caution";
import { EmptyState } from "@/components/ui/EmptyState";
import { ALERT_KIND_LABELS } from "@/lib/alerts/kinds";
import { formatUnitTime } from "@/lib/time/zone";
import type { CareTeam, HandoffBed, HandoffView, ShiftView } from "@/lib/handoff/queries";
import { AcknowledgeButton, PrintButton, PrintedAt } from "./HandoffControls";

const at = formatUnitTime;

function hm(iso: string, timeZone: string): string {
  return new Intl.DateTimeFormat("en-GB", {
    timeZone,
    hour: "2-digit",
    minute: "2-digit",
    hourCycle: "h23",
  }).format(new Date(iso));
}

export const shiftLabel = (s: ShiftView, timeZone: string) =>
  `${at(s.startsAt, timeZone)}–${hm(s.endsAt, timeZone)}`;

const pct = (share: number) => `${Math.round(share * 100)} %`;

function Fact({ label, children }: { label: string; children: ReactNode }) {
  return (
    <div className="min-w-0">
      <dt className="text-xs font-medium tracking-wide text-ink-muted">{label}</dt>
      <dd className="text-sm">{children}</dd>
    </div>
  );
}

function Team({ team }: { team: CareTeam }) {
  const name = (p: { name: string } | null) => p?.name ?? "not assigned";
  return (
    <span>
      Nurse {name(team.nurse)} · Therapist {name(team.therapist)} · Physician {name(team.physician)}
    </span>
  );
}

function limitsText(bed: HandoffBed): string {
  const o = bed.order!;
  const parts = [`FiO2 ${o.limits.fio2Min.toFixed(2)}–${o.limits.fio2Max.toFixed(2)}`];
  if (o.limits.peepMin !== null && o.limits.peepMax !== null)
    parts.push(`PEEP ${o.limits.peepMin}–${o.limits.peepMax} cmH2O`);
  if (o.limits.flowMin !== null && o.limits.flowMax !== null)
    parts.push(`flow ${o.limits.flowMin}–${o.limits.flowMax} L/min`);
  return parts.join(", ");
}

function settingsText(bed: HandoffBed): string {
  const s = bed.settings!;
  const parts = [
    s.deviceLabel,
    `FiO2 ${s.fio2.toFixed(2)}${s.fio2Estimated ? " (estimated)" : ""}`,
  ];
  if (s.peep !== null) parts.push(`PEEP ${s.peep} cmH2O`);
  if (s.flow !== null) parts.push(`flow ${s.flow} L/min`);
  return parts.join(", ");
}

function BedBlock({
  bed,
  view,
  actorId,
  canAcknowledge,
}: {
  bed: HandoffBed;
  view: HandoffView;
  actorId: number;
  canAcknowledge: boolean;
}) {
  const tz = view.unit.timeZone;
  const mine = bed.acknowledgements.some((a) => a.userId === actorId);
  const gas = bed.latestBloodGas;
  const tib = bed.timeInBand;
  return (
    <article
      className="print-keep space-y-3 rounded-card border border-border bg-surface p-4 print:rounded-none print:border-black print:p-3"
      aria-labelledby={`bed-${bed.bedId}`}
      data-testid="handoff-bed"
    >
      <header className="flex flex-wrap items-baseline justify-between gap-2">
        <h2 id={`bed-${bed.bedId}`} className="text-lg font-semibold">
          Bed {bed.bedLabel} · {bed.patient.name}
          <span className="ml-2 text-sm font-normal text-ink-muted">
            MRN {bed.patient.mrn} · {bed.patient.age} y
          </span>
        </h2>
        {bed.openAlerts.length > 0 ? (
          <span className="rounded border border-below px-2 py-0.5 text-xs font-medium text-below">
            {bed.openAlerts.length} open alert{bed.openAlerts.length === 1 ? "" : "s"}
          </span>
        ) : null}
      </header>
      <dl className="grid grid-cols-1 gap-x-6 gap-y-2 sm:grid-cols-2 lg:grid-cols-3 print:grid-cols-3">
        <Fact label="Order in effect">
          {bed.order ? (
            <>
              {bed.order.deviceLabel}, SpO2 {bed.order.spo2Band.lower}–{bed.order.spo2Band.upper} %
              <br />
              {limitsText(bed)}
              {bed.order.status === "awaiting_cosign" ? " (awaiting co-signature)" : ""}
            </>
          ) : (
            "No order in effect"
          )}
        </Fact>
        <Fact label="Applied at the bedside">
          {bed.settings ? (
            <>
              {settingsText(bed)}
              <br />
              <span className="text-ink-muted">
                reassessed {at(bed.settings.lastReassessedAt, tz)}
              </span>
            </>
          ) : (
            "Nothing recorded"
          )}
        </Fact>
        <Fact label={`Time in band this shift (since ${hm(tib.from, tz)})`}>
          in {pct(tib.inBand)} · below {pct(tib.below)} · above {pct(tib.above)} · unknown{" "}
          {pct(tib.unknown)}
        </Fact>
        <Fact label="Latest SpO2">
          {bed.latestReading
            ? `${bed.latestReading.spo2} % on FiO2 ${bed.latestReading.fio2.toFixed(2)} at ${at(bed.latestReading.takenAt, tz)}`
            : "No reading"}
        </Fact>
        <Fact label="Latest blood gas">
          {gas
            ? `${gas.sampleType === "arterial" ? "Arterial" : "Venous"}: PaO2 ${gas.pao2}, PaCO2 ${gas.paco2} mmHg${gas.pfRatio !== null ? `, P/F ${Math.round(gas.pfRatio)}` : ""} at ${at(gas.sampledAt, tz)}`
            : "No blood gas"}
        </Fact>
        <Fact label="Open alerts">
          {bed.openAlerts.length
            ? bed.openAlerts
                .map(
                  (a) =>
                    `${ALERT_KIND_LABELS[a.kind]}${a.grade === "urgent" ? " (urgent)" : ""} since ${at(a.openedAt, tz)}`,
                )
                .join("; ")
            : "None"}
        </Fact>
        <Fact label={`Going off (${shiftLabel(view.outgoing, tz)})`}>
          <Team team={bed.outgoingTeam} />
        </Fact>
        <Fact label={`Coming on (${shiftLabel(view.incoming, tz)})`}>
          <Team team={bed.incomingTeam} />
        </Fact>
        <Fact label="Handoff acknowledged">
          {bed.acknowledgements.length ? (
            <span data-testid="handoff-acknowledged">
              {bed.acknowledgements
                .map(
                  (a) =>
                    `by ${a.userId === actorId ? "you" : a.name} at ${at(a.acknowledgedAt, tz)}`,
                )
                .join("; ")}
            </span>
          ) : (
            <span>
              Not yet
              {bed.incomingTeam.nurse ? ` (incoming nurse ${bed.incomingTeam.nurse.name})` : ""}
            </span>
          )}
          {/* Paper keeps a line to sign on. */}
          <span className="hidden print:block">Received by: ____________________</span>
        </Fact>
      </dl>
      {canAcknowledge && !mine ? (
        <AcknowledgeButton
          unitId={view.unit.id}
          shift={view.incoming.startsAt}
          admissionIds={[bed.admissionId]}
          label="Acknowledge"
          accessibleLabel={`Acknowledge the handoff of bed ${bed.bedLabel}`}
        />
      ) : null}
    </article>
  );
}

/** The handoff of one unit for one handover: on screen and on paper. */
export function HandoffSheet({
  view,
  actorId,
  canAcknowledge,
}: {
  view: HandoffView;
  actorId: number;
  canAcknowledge: boolean;
}) {
  const tz = view.unit.timeZone;
  const myOpen = view.beds.filter(
    (b) =>
      b.incomingTeam.nurse?.id === actorId && !b.acknowledgements.some((a) => a.userId === actorId),
  );
  return (
    <div className="space-y-4 print:space-y-2 print:text-black">
      <div className="flex flex-wrap items-start justify-between gap-2">
        <div>
          <h1 className="text-2xl font-semibold tracking-tight">
            Handoff · {view.unit.code} {view.unit.name}
          </h1>
          <p className="text-sm text-ink-muted">
            Shift {shiftLabel(view.outgoing, tz)} hands over to {shiftLabel(view.incoming, tz)} ·{" "}
            {view.beds.length} occupied bed{view.beds.length === 1 ? "" : "s"}
          </p>
          <p className="text-sm text-ink-muted">
            <span className="print:hidden">As of </span>
            <span className="hidden print:inline">Printed </span>
            <PrintedAt initial={view.now} timeZone={tz} />
          </p>
        </div>
        <div className="flex flex-wrap items-center gap-2 print:hidden">
          {canAcknowledge && myOpen.length > 1 ? (
            <AcknowledgeButton
              unitId={view.unit.id}
              shift={view.incoming.startsAt}
              admissionIds={myOpen.map((b) => b.admissionId)}
              label={`Acknowledge my ${myOpen.length} beds`}
              variant="secondary"
            />
          ) : null}
          <PrintButton />
        </div>
      </div>
      <Caution compact />
      {view.beds.length === 0 ? (
        <EmptyState title="No occupied beds">
          Nobody is admitted to {view.unit.code} now, so there is nothing to hand over.
        </EmptyState>
      ) : (
        <div className="space-y-3 print:space-y-2">
          {view.beds.map((bed) => (
            <BedBlock
              key={bed.bedId}
              bed={bed}
              view={view}
              actorId={actorId}
              canAcknowledge={canAcknowledge}
            />
          ))}
        </div>
      )}
    </div>
  );
}

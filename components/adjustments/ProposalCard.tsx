import { formatPressureNumber } from "@/components/oxygenation/format";
import { formatFio2Value } from "@/components/bedside/BedsideFormParts";
import { Button } from "@/components/ui/Button";
import {
  IconAbove,
  IconBelow,
  IconEscalated,
  IconInBand,
  IconWarning,
} from "@/components/ui/icons";
import {
  PEEP_NOT_FORECAST,
  type PressureUnit,
  type Proposal,
  type ProposalDirection,
  type ProposedSetting,
} from "@/lib/oxygen";

const DIRECTION: Record<
  ProposalDirection,
  { label: string; Icon: typeof IconAbove; className: string }
> = {
  up: { label: "Step up", Icon: IconAbove, className: "text-below" },
  down: { label: "Step down (wean)", Icon: IconBelow, className: "text-above" },
  hold: { label: "Hold the current settings", Icon: IconInBand, className: "text-in-band" },
  escalate: { label: "Escalate to the prescriber", Icon: IconEscalated, className: "text-below" },
};

/** "FiO2 0.50, PEEP 10 cmH2O, flow 50 L/min" */
export function describeSetting(step: Pick<ProposedSetting, "fio2" | "peep" | "flow">): string {
  const parts = [`FiO2 ${formatFio2Value(step.fio2)}`];
  if (step.peep !== undefined) parts.push(`PEEP ${step.peep} cmH2O`);
  if (step.flow !== undefined) parts.push(`flow ${step.flow} L/min`);
  return parts.join(", ");
}

/**
 * The engine's proposal for the next step from the order's step table: its
 * direction, the step, the reason and caveats, and a button that fills the form.
 * At urgent depth it says first, in its own band, to call the prescriber now —
 * the step within the order is what to do meanwhile — and which limit stops it.
 */
export function ProposalCard({
  proposal,
  proposalError,
  hasReading,
  pressureUnit,
  onUse,
}: {
  proposal: Proposal | null;
  proposalError: string | null;
  hasReading: boolean;
  pressureUnit: PressureUnit;
  onUse: (step: ProposedSetting, direction: ProposalDirection) => void;
}) {
  if (!proposal) {
    return (
      <section
        className="rounded-card border border-border bg-surface p-3 text-sm shadow-card"
        data-testid="proposal"
      >
        <h2 className="text-sm font-semibold">Suggested next step</h2>
        <p className="mt-1 text-ink-muted">
          {proposalError
            ? `No proposal: ${proposalError}`
            : hasReading
              ? "No proposal for these settings."
              : "No proposal yet: the engine proposes from the latest SpO2, and no reading has been charted."}
        </p>
      </section>
    );
  }
  const look = DIRECTION[proposal.direction];
  const caveats = proposal.caveats.filter((c) => c !== PEEP_NOT_FORECAST);
  return (
    <section
      aria-labelledby="proposal-heading"
      className="rounded-card border border-border bg-accent-soft p-3 text-sm shadow-card"
      data-testid="proposal"
    >
      {proposal.urgent ? (
        <p
          className="mb-2 flex items-start gap-2 rounded-md border border-below bg-below-soft px-3 py-2 font-semibold text-below"
          data-testid="proposal-urgent"
        >
          <IconWarning className="mt-0.5 shrink-0" />
          <span>
            Urgent: SpO2 is at urgent depth — call the prescriber now.
            {proposal.stoppedBy ? (
              <span className="block font-normal">
                Within this order the step stops at {proposal.stoppedBy}.
              </span>
            ) : null}
          </span>
        </p>
      ) : null}
      <div className="flex flex-wrap items-start justify-between gap-2">
        <div className="min-w-0 space-y-1">
          <h2 id="proposal-heading" className="text-sm font-semibold">
            Suggested next step:{" "}
            <span className={`inline-flex items-center gap-1 ${look.className}`}>
              <look.Icon className="shrink-0" />
              {look.label}
            </span>
            {proposal.step ? (
              <span className="tabular"> to {describeSetting(proposal.step)}</span>
            ) : null}
            {proposal.stepsMoved > 1 ? (
              <span className="font-normal text-ink-muted">
                {" "}
                ({proposal.stepsMoved} table settings)
              </span>
            ) : null}
          </h2>
          <p>{proposal.reason}</p>
          {proposal.forecast ? (
            <p className="tabular text-ink-muted">
              At FiO2 {formatFio2Value(proposal.step?.fio2 ?? 0)}: PaO2 forecast{" "}
              {formatPressureNumber(proposal.forecast.range.low.pao2, pressureUnit)}–
              {formatPressureNumber(proposal.forecast.range.high.pao2, pressureUnit)} {pressureUnit}
            </p>
          ) : null}
        </div>
        {proposal.step ? (
          <Button
            variant="secondary"
            onClick={() => proposal.step && onUse(proposal.step, proposal.direction)}
          >
            Use proposed step
          </Button>
        ) : null}
      </div>
      {caveats.length > 0 ? (
        <ul className="mt-1.5 list-disc space-y-0.5 pl-5 text-xs text-ink-muted">
          {caveats.map((c) => (
            <li key={c}>{c}</li>
          ))}
        </ul>
      ) : null}
    </section>
  );
}

import { IconCheck, IconInfo, IconOverdue, IconWarning } from "@/components/ui/icons";
import { STATUS_LABELS } from "@/lib/rehearsal/labels";
import type { RehearsalStatus } from "@/lib/rehearsal/views";

const ICONS = { queued: IconOverdue, running: IconInfo, done: IconCheck, failed: IconWarning };

/**
 * A run's status as a neutral outline chip, by word and icon: colour on this
 * page is kept for SpO2 state (below, in, above the band).
 */
export function StatusChip({ status }: { status: RehearsalStatus }) {
  const Icon = ICONS[status];
  return (
    <span
      data-testid="run-status"
      className="inline-flex items-center gap-1 rounded-full border border-border-strong px-2 py-0.5 text-xs font-medium text-ink"
    >
      <Icon className="shrink-0" aria-hidden="true" />
      {STATUS_LABELS[status]}
    </span>
  );
}

import type { ComponentType, SVGProps } from "react";
import { IconAbove, IconBelow, IconEscalated, IconInBand, IconInfo, IconOverdue } from "./icons";

export type Status = "in-band" | "below" | "above" | "overdue" | "escalated" | "neutral";

const LOOK: Record<
  Status,
  { label: string; className: string; Icon: ComponentType<SVGProps<SVGSVGElement>> }
> = {
  "in-band": { label: "In band", className: "bg-in-band-soft text-in-band", Icon: IconInBand },
  below: { label: "Below band", className: "bg-below-soft text-below", Icon: IconBelow },
  above: { label: "Above band on O₂", className: "bg-above-soft text-above", Icon: IconAbove },
  overdue: { label: "Overdue", className: "bg-overdue-soft text-overdue", Icon: IconOverdue },
  escalated: { label: "Escalated", className: "bg-below-soft text-below", Icon: IconEscalated },
  neutral: { label: "No data", className: "bg-surface-muted text-ink-muted", Icon: IconInfo },
};

/** Status by word and shape as well as colour. */
export function StatusBadge({ status, label }: { status: Status; label?: string }) {
  const look = LOOK[status];
  return (
    <span
      className={`inline-flex items-center gap-1 rounded-full px-2 py-0.5 text-xs font-medium ${look.className}`}
    >
      <look.Icon className="shrink-0" />
      {label ?? look.label}
    </span>
  );
}

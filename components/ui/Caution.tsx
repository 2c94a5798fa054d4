import { IconWarning } from "./icons";

/** The decision-support caution that accompanies every proposed change. */
export function Caution({ compact = false }: { compact?: boolean }) {
  return (
    <p
      role="note"
      className={`flex items-start gap-2 rounded-md border border-overdue/40 bg-overdue-soft text-overdue ${compact ? "px-2 py-1 text-xs" : "px-3 py-2 text-sm"}`}
    >
      <IconWarning className="mt-0.5 shrink-0" />
      <span>
        Tidemark is decision support. Local protocols and the licensed clinicians caring for the
        patient decide every change.
      </span>
    </p>
  );
}

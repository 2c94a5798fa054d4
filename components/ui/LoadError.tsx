import { Button } from "./Button";
import { IconWarning } from "./icons";

/** A failed fetch, said in words, with a way to try again. `what` names it: "the ledger". */
export function LoadError({
  what,
  message,
  onRetry,
}: {
  what: string;
  message: string;
  onRetry: () => void;
}) {
  return (
    <div
      role="alert"
      className="flex flex-wrap items-center gap-3 rounded-card border border-below/40 bg-below-soft px-4 py-3 text-below"
    >
      <IconWarning className="shrink-0 text-lg" />
      <p className="min-w-0 flex-1 text-sm font-medium">
        {what[0]!.toUpperCase() + what.slice(1)} could not be loaded: {message}
      </p>
      <Button variant="secondary" onClick={onRetry}>
        Try again
      </Button>
    </div>
  );
}

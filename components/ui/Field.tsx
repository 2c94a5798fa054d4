import type { ReactNode } from "react";

/**
 * A labelled form control with its hint and error in words, linked by
 * aria-describedby so screen readers read them with the field.
 */
export function Field({
  id,
  label,
  hint,
  error,
  children,
}: {
  id: string;
  label: ReactNode;
  hint?: ReactNode;
  error?: string;
  children: (describedBy: string | undefined, invalid: boolean) => ReactNode;
}) {
  const hintId = hint ? `${id}-hint` : undefined;
  const errorId = error ? `${id}-error` : undefined;
  const describedBy = [hintId, errorId].filter(Boolean).join(" ") || undefined;
  return (
    <div className="flex flex-col gap-1">
      <label htmlFor={id} className="text-sm font-medium text-ink">
        {label}
      </label>
      {children(describedBy, Boolean(error))}
      {hint ? (
        <p id={hintId} className="text-xs text-ink-muted">
          {hint}
        </p>
      ) : null}
      <p id={errorId} className="min-h-4 text-xs font-medium text-below" aria-live="polite">
        {error ?? ""}
      </p>
    </div>
  );
}

export const inputClasses =
  "w-full rounded-md border border-border-strong bg-surface px-2.5 py-1.5 text-base text-ink placeholder:text-ink-muted aria-[invalid=true]:border-below";

"use client";

/**
 * Choose units by checkbox (users, API tokens): a fieldset with its legend and
 * the error in words, linked by aria-describedby. Controlled: pass the value
 * and onChange of a react-hook-form Controller field.
 */
export function UnitCheckboxes({
  units,
  value,
  onChange,
  onBlur,
  errorId,
  error,
}: {
  units: readonly { id: number; label: string }[];
  value: readonly number[];
  onChange: (next: number[]) => void;
  onBlur?: () => void;
  errorId: string;
  error?: string;
}) {
  return (
    <fieldset aria-describedby={error ? errorId : undefined}>
      <legend className="text-sm font-medium">Units</legend>
      <div className="mt-1 flex flex-wrap gap-4">
        {units.map((u) => (
          <label key={u.id} className="flex items-center gap-2 text-sm">
            <input
              type="checkbox"
              className="size-4 accent-accent"
              checked={value.includes(u.id)}
              onChange={(e) =>
                onChange(e.target.checked ? [...value, u.id] : value.filter((id) => id !== u.id))
              }
              onBlur={onBlur}
            />
            {u.label}
          </label>
        ))}
      </div>
      <p id={errorId} className="min-h-4 text-xs font-medium text-below" aria-live="polite">
        {error ?? ""}
      </p>
    </fieldset>
  );
}

import { buttonClasses } from "@/components/ui/Button";

const selectClasses = "rounded-md border border-border-strong bg-surface px-2 py-1.5 text-sm";

/**
 * The unit whose runs the page shows: a plain GET form, as on Reports, so the
 * choice lives in the address and works from the keyboard and without script.
 * Choosing another unit clears the chosen runs (they belong to one unit).
 */
export function UnitPicker({
  units,
  unitId,
}: {
  units: { id: number; code: string; name: string }[];
  unitId: number;
}) {
  return (
    <form method="get" action="/rehearsals" className="flex flex-wrap items-end gap-3 print:hidden">
      <div className="flex flex-col gap-1">
        <label htmlFor="rehearsal-unit" className="text-sm font-medium">
          Unit
        </label>
        <select id="rehearsal-unit" name="unit" defaultValue={unitId} className={selectClasses}>
          {units.map((u) => (
            <option key={u.id} value={u.id}>
              {u.code} · {u.name}
            </option>
          ))}
        </select>
      </div>
      <button type="submit" className={buttonClasses("secondary")}>
        Show
      </button>
    </form>
  );
}

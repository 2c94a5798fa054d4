import { buttonClasses } from "@/components/ui/Button";
import { inputClasses } from "@/components/ui/Field";

/**
 * The unit a page shows, as a plain GET form: the choice lands in the address
 * and works from the keyboard and without script. `keep` carries the page's
 * other choices (the shift) across; anything not kept is cleared.
 */
export function UnitChooser({
  units,
  value,
  action,
  keep = {},
  id = "unit",
}: {
  units: { id: number; code: string; name: string }[];
  value: number;
  action: string;
  keep?: Record<string, string>;
  id?: string;
}) {
  return (
    <form method="get" action={action} className="flex flex-wrap items-end gap-2 print:hidden">
      {Object.entries(keep).map(([name, v]) => (
        <input key={name} type="hidden" name={name} value={v} />
      ))}
      <div className="flex flex-col gap-1">
        <label htmlFor={id} className="text-sm font-medium text-ink">
          Unit
        </label>
        <select id={id} name="unit" defaultValue={value} className={inputClasses}>
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

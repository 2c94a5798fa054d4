import { buttonClasses } from "@/components/ui/Button";

/** A plain GET form: works from the keyboard and without script. */
export function UnitChooser({
  units,
  value,
}: {
  units: { id: number; code: string; name: string }[];
  value: number;
}) {
  return (
    <form method="get" action="/handoff" className="flex flex-wrap items-end gap-2 print:hidden">
      <label className="flex flex-col gap-1 text-sm font-medium">
        Unit
        <select
          name="unit"
          defaultValue={value}
          className="rounded-md border border-border-strong bg-surface px-2 py-1.5 text-sm"
        >
          {units.map((u) => (
            <option key={u.id} value={u.id}>
              {u.code} · {u.name}
            </option>
          ))}
        </select>
      </label>
      <button type="submit" className={buttonClasses("secondary")}>
        Show
      </button>
    </form>
  );
}

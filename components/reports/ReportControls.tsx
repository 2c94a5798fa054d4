import Link from "next/link";
import { buttonClasses } from "@/components/ui/Button";
import {
  PERIOD_CHOICES,
  PERIOD_LABELS,
  REPORT_LABELS,
  REPORT_PAGES,
  reportHref,
  type ReportChoice,
} from "@/lib/reports/period";

const selectClasses = "rounded-md border border-border-strong bg-surface px-2 py-1.5 text-sm";

/**
 * The unit and period pickers: a plain GET form, so the choice lives in the
 * address, works from the keyboard and without script. The report tabs are
 * links that keep the unit and period.
 */
export function ReportControls({
  units,
  choice,
}: {
  units: { id: number; code: string; name: string }[];
  choice: ReportChoice & { unitId: number };
}) {
  return (
    <div className="space-y-3 print:hidden">
      <form method="get" action="/reports" className="group flex flex-wrap items-end gap-3">
        <input type="hidden" name="report" value={choice.report} />
        <div className="flex flex-col gap-1">
          <label htmlFor="report-unit" className="text-sm font-medium">
            Unit
          </label>
          <select
            id="report-unit"
            name="unit"
            defaultValue={choice.unitId}
            className={selectClasses}
          >
            {units.map((u) => (
              <option key={u.id} value={u.id}>
                {u.code} · {u.name}
              </option>
            ))}
          </select>
        </div>
        <fieldset className="flex flex-col gap-1">
          <legend className="mb-1 text-sm font-medium">Period</legend>
          <div className="flex flex-wrap gap-1">
            {PERIOD_CHOICES.map((p) => (
              <label
                key={p}
                className="flex cursor-pointer items-center gap-1.5 rounded-md border border-border-strong bg-surface px-2 py-1 text-sm has-[:checked]:border-accent has-[:checked]:bg-accent-soft has-[:checked]:text-accent-strong has-[:focus-visible]:outline-2 has-[:focus-visible]:outline-focus"
              >
                <input
                  type="radio"
                  name="period"
                  value={p}
                  id={`period-${p}`}
                  defaultChecked={choice.period === p}
                  className="accent-accent"
                />
                {PERIOD_LABELS[p]}
              </label>
            ))}
          </div>
        </fieldset>
        <div className="hidden flex-wrap items-end gap-2 group-has-[#period-custom:checked]:flex">
          <label className="flex flex-col gap-1 text-sm font-medium">
            First day
            <input
              type="date"
              name="from"
              defaultValue={choice.fromDay ?? ""}
              className={selectClasses}
            />
          </label>
          <label className="flex flex-col gap-1 text-sm font-medium">
            Last day
            <input
              type="date"
              name="to"
              defaultValue={choice.toDay ?? ""}
              className={selectClasses}
            />
          </label>
        </div>
        <button type="submit" className={buttonClasses("primary")}>
          Show
        </button>
      </form>
      <nav aria-label="Reports">
        <ul className="flex flex-wrap gap-1 border-b border-border">
          {REPORT_PAGES.map((kind) => {
            const current = kind === choice.report;
            return (
              <li key={kind}>
                <Link
                  href={reportHref(choice, { report: kind })}
                  aria-current={current ? "page" : undefined}
                  className={`-mb-px inline-block rounded-t-md border-b-2 px-3 py-1.5 text-sm font-medium ${current ? "border-accent text-accent-strong" : "border-transparent text-ink-muted hover:text-ink"}`}
                >
                  {REPORT_LABELS[kind]}
                </Link>
              </li>
            );
          })}
        </ul>
      </nav>
    </div>
  );
}

import Link from "next/link";
import type { DueSoonBed } from "@/lib/due-soon/queries";

function clock(iso: string): string {
  return new Date(iso).toLocaleTimeString("en-GB", {
    hour: "2-digit",
    minute: "2-digit",
    hourCycle: "h23",
  });
}

/**
 * The caller's beds whose reassessment falls due within the hour, soonest
 * first — before they become "reassessment overdue" alerts.
 */
export function DueSoonList({
  beds,
  windowMinutes,
}: {
  beds: DueSoonBed[];
  windowMinutes: number;
}) {
  return (
    <section aria-labelledby="due-soon-heading" className="space-y-2" data-testid="due-soon">
      <h2 id="due-soon-heading" className="text-lg font-semibold">
        Reassessments due in the next {windowMinutes} min{" "}
        <span className="font-normal text-ink-muted">({beds.length})</span>
      </h2>
      {beds.length === 0 ? (
        <p className="text-sm text-ink-muted">
          None of your beds falls due within the hour. Overdue ones are on the alerts page.
        </p>
      ) : (
        <ul className="divide-y divide-border rounded-card border border-border bg-surface shadow-card">
          {beds.map((b) => (
            <li
              key={b.patientId}
              className="flex flex-wrap items-baseline gap-x-3 px-3 py-2 text-sm"
            >
              <Link href={`/patients/${b.patientId}`} className="font-medium text-accent underline">
                {b.unitCode} bed {b.bedLabel}
              </Link>
              <span className="tabular">
                due {clock(b.dueAt)} · {b.minutesLeft === 0 ? "due now" : `in ${b.minutesLeft} min`}
              </span>
              <span className="text-ink-muted">
                every {b.reassessMinutes} min, as {b.duty}
              </span>
            </li>
          ))}
        </ul>
      )}
    </section>
  );
}

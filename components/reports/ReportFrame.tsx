import type { ReactNode } from "react";
import { Caution } from "@/components/ui/Caution";
import { periodLine, unitClock } from "@/lib/reports/csv";
import type { ReportPeriod } from "@/lib/reports/types";

/**
 * The frame every report shares: its title with the unit, the period and
 * when it was generated, what the report counts (`intro`), and the caution.
 * On paper, the unit and period head every sheet: the wrapper is a layout
 * table (role="presentation") whose header Chromium repeats at the top of
 * each printed page without covering the content; on screen it is plain
 * blocks and the header is not shown.
 */
export function ReportFrame({
  label,
  period,
  intro,
  children,
}: {
  label: string;
  period: ReportPeriod;
  intro?: ReactNode;
  children: ReactNode;
}) {
  const when = periodLine(period);
  return (
    <table role="presentation" className="report-print">
      <thead className="report-print-head" aria-hidden="true">
        <tr>
          <td className="border-b border-border pb-1 text-xs">
            Tidemark · {label} · {when}
          </td>
        </tr>
      </thead>
      <tbody className="report-print-body">
        <tr>
          <td>
            <div className="space-y-5" data-testid="report-view">
              <header className="space-y-1">
                <h2 className="text-xl font-semibold">
                  {label} — {period.unitCode} ({period.unitName})
                </h2>
                <p className="text-sm text-ink-muted" data-testid="report-period">
                  {when}. Generated {unitClock(period.generatedAt, period.timeZone)}.
                </p>
                {intro ? <p className="text-sm">{intro}</p> : null}
              </header>
              <Caution />
              {children}
            </div>
          </td>
        </tr>
      </tbody>
    </table>
  );
}

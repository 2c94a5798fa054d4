import { EmptyState } from "@/components/ui/EmptyState";
import { REPORT_LABELS } from "@/lib/reports/period";
import { chartSpec, chartTable } from "@/lib/reports/charts";
import { alertKindTable, GROUP_LABELS, groupTable } from "@/lib/reports/tables";
import { summaryTiles } from "@/lib/reports/tiles";
import type { AlertsReport, ReportGroup, ReportKind, ReportOf } from "@/lib/reports/types";
import { BasisList } from "./BasisList";
import { ReportFrame } from "./ReportFrame";
import { ReportChart } from "./ReportChart";
import { ReportTableView } from "./ReportTableView";
import { SummaryTiles } from "./SummaryTiles";

export type ReportSet<K extends ReportKind = ReportKind> = {
  kind: K;
  byPatient: ReportOf<K>;
  byBed: ReportOf<K>;
  overTime: ReportOf<K>;
  overTimeGroup: Extract<ReportGroup, "day" | "shift">;
};

/**
 * One report for one unit and period: tiles, a chart over time and one per
 * bed (each with its table), the table per patient, the basis and the
 * caution. On paper, the unit and period head every sheet: the wrapper is a
 * layout table (role="presentation") whose header Chromium repeats at the top
 * of each printed page without covering the content; on screen it is plain
 * blocks and the header is not shown.
 */
export function ReportView({ set }: { set: ReportSet }) {
  const { kind, byPatient } = set;
  const label = REPORT_LABELS[kind];
  const period = byPatient.period;
  const overTitle = `${label} by ${GROUP_LABELS[set.overTimeGroup].toLowerCase()}`;
  const overSpec = chartSpec(kind, set.overTime, overTitle);
  const bedSpec = chartSpec(kind, set.byBed, `${label} by bed`);
  const patientTable = groupTable(kind, byPatient, "patient", `${label} by patient`);
  const common = { period, reportLabel: label };

  return (
    <ReportFrame label={label} period={period}>
      {byPatient.rows.length === 0 ? (
        <EmptyState title="Nothing to report">
          No patient was on {period.unitCode} in this period, so there is nothing to count. Choose a
          longer period or another unit.
        </EmptyState>
      ) : (
        <>
          <SummaryTiles tiles={summaryTiles(kind, byPatient)} label={`${label}, whole unit`} />
          <section aria-label={overTitle} className="grid gap-4 lg:grid-cols-2 print:grid-cols-1">
            <ReportChart spec={overSpec} id={`${kind}-over-time`} />
            <ReportTableView
              table={chartTable(
                overSpec,
                `${kind}-${set.overTimeGroup}`,
                GROUP_LABELS[set.overTimeGroup],
              )}
              {...common}
            />
          </section>
          <section
            aria-label={`${label} by bed`}
            className="grid gap-4 lg:grid-cols-2 print:grid-cols-1"
          >
            <ReportChart spec={bedSpec} id={`${kind}-by-bed`} />
            <ReportTableView table={chartTable(bedSpec, `${kind}-bed`, "Bed")} {...common} />
          </section>
          {kind === "alerts" ? (
            <ReportTableView table={alertKindTable(byPatient as AlertsReport)} {...common} />
          ) : null}
          <ReportTableView table={patientTable} {...common} />
        </>
      )}
      <BasisList basis={byPatient.basis} />
    </ReportFrame>
  );
}

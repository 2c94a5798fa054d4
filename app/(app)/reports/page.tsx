import type { Metadata } from "next";
import { cookies } from "next/headers";
import { notFound } from "next/navigation";
import { ForecastAccuracyReportView } from "@/components/forecast-accuracy/ForecastAccuracyReportView";
import { PrintButton } from "@/components/reports/PrintButton";
import { ReportControls } from "@/components/reports/ReportControls";
import { ReportView, type ReportSet } from "@/components/reports/ReportView";
import { EmptyState } from "@/components/ui/EmptyState";
import { assertUnitAccess } from "@/lib/auth/actor-queries";
import { pagePermission } from "@/lib/auth/page-guard";
import { db } from "@/lib/db";
import { loadForecastAccuracyReport } from "@/lib/forecast-accuracy/queries";
import type { ForecastAccuracyReport } from "@/lib/forecast-accuracy/views";
import { resolveUnitChoice, UNIT_COOKIE } from "@/lib/preferences/unit";
import { parseReportSearch, resolvePeriod, type ReportSearch } from "@/lib/reports/period";
import { loadReport } from "@/lib/reports/queries";
import { getUnit, listUnits } from "@/lib/units/queries";

export const metadata: Metadata = { title: "Reports" };

/**
 * Reports: one unit, one period (kept in the address), one of the four
 * grouped reports — tiles, charts over time and per bed, the table per
 * patient — or forecast accuracy (each checked forecast, per model, device
 * and FiO2 step); each table as CSV, and a print view. Every role reads its
 * own units; reviewers land here.
 */
export default async function ReportsPage({
  searchParams,
}: {
  searchParams: Promise<ReportSearch>;
}) {
  const actor = await pagePermission("record.read");
  const choice = parseReportSearch(await searchParams);
  const units = await listUnits(db(), actor.unitIds);
  if (units.length === 0)
    return (
      <EmptyState title="No unit">
        You are not on any unit, so there is nothing to report.
      </EmptyState>
    );

  // The unit asked for, else the one chosen in the header, else the first.
  const { choice: headerChoice } = resolveUnitChoice(
    (await cookies()).get(UNIT_COOKIE)?.value,
    actor.unitIds,
  );
  const unitId = choice.unitId ?? (headerChoice !== "all" ? headerChoice : units[0]!.id);
  if (!units.some((u) => u.id === unitId)) notFound();
  assertUnitAccess(actor, unitId);
  const unit = await getUnit(db(), unitId);
  if (!unit) notFound();

  const now = new Date();
  const period = resolvePeriod(choice, unit, now);
  let set: ReportSet | null = null;
  let forecasts: ForecastAccuracyReport | null = null;
  if (period.ok) {
    const params = { unitId, from: period.from, to: period.to };
    const kind = choice.report;
    if (kind === "forecast-accuracy") {
      forecasts = await loadForecastAccuracyReport(db(), params, now);
    } else {
      const [byPatient, byBed, overTime] = await Promise.all([
        loadReport(db(), kind, { ...params, groupBy: "patient" }, now),
        loadReport(db(), kind, { ...params, groupBy: "bed" }, now),
        loadReport(db(), kind, { ...params, groupBy: period.overTime }, now),
      ]);
      set = { kind, byPatient, byBed, overTime, overTimeGroup: period.overTime };
    }
  }

  return (
    <div className="space-y-4">
      <div className="flex flex-wrap items-baseline justify-between gap-2 print:hidden">
        <h1 className="text-2xl font-semibold tracking-tight">Reports</h1>
        {set || forecasts ? <PrintButton /> : null}
      </div>
      <ReportControls units={units} choice={{ ...choice, unitId }} />
      {period.ok ? null : (
        <p role="alert" className="rounded-md border border-below px-3 py-2 text-sm text-below">
          {period.message}
        </p>
      )}
      {set ? <ReportView set={set} /> : null}
      {forecasts ? (
        <ForecastAccuracyReportView
          report={forecasts}
          timeZone={unit.timeZone}
          pressureUnit={actor.pressureUnit}
        />
      ) : null}
    </div>
  );
}

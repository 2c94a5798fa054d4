import { BasisList } from "@/components/reports/BasisList";
import { ReportFrame } from "@/components/reports/ReportFrame";
import { ReportTableView } from "@/components/reports/ReportTableView";
import { SummaryTiles } from "@/components/reports/SummaryTiles";
import { EmptyState } from "@/components/ui/EmptyState";
import {
  calibrationSeries,
  deviceTable,
  fio2StepTable,
  FORECAST_REPORT_LABEL,
  forecastReportPeriod,
  forecastTiles,
  modelTable,
  pairsTable,
  reasonTable,
  uncheckedTable,
} from "@/lib/forecast-accuracy/report-tables";
import type { ForecastAccuracyReport } from "@/lib/forecast-accuracy/views";
import type { PressureUnit } from "@/lib/oxygen/units";
import { CalibrationChart } from "./CalibrationChart";

/**
 * The forecast-accuracy report of one unit and period: tiles, each model's
 * errors with the calibration plot, the tables by device and by FiO2 step,
 * the unchecked changes by reason, every checked forecast and every unchecked
 * change (each table with its CSV), the basis and the caution. Printed like
 * the other reports: a layout table whose header (unit and period) Chromium
 * repeats on every sheet.
 */
export function ForecastAccuracyReportView({
  report,
  timeZone,
  pressureUnit,
}: {
  report: ForecastAccuracyReport;
  timeZone: string;
  pressureUnit: PressureUnit;
}) {
  const label = FORECAST_REPORT_LABEL;
  const period = forecastReportPeriod(report, timeZone);
  const common = { period, reportLabel: label };
  const calibration = calibrationSeries(report.calibration, pressureUnit);
  const { minMinutes, maxMinutes } = report.settings;

  return (
    <ReportFrame
      label={label}
      period={period}
      intro={
        <>
          Every FiO2 change recorded on the unit in the period, its stored PaO2 forecast checked
          against the first arterial gas {minMinutes}–{maxMinutes} min after it (which may come
          after the period ends). Errors are forecast − measured, in {pressureUnit}.
        </>
      }
    >
      {report.counts.changes === 0 ? (
        <EmptyState title="No recorded change to check">
          No settings change was recorded on {period.unitCode} in this period, so no forecast could
          be checked. Choose a longer period or another unit.
        </EmptyState>
      ) : (
        <>
          <SummaryTiles
            tiles={forecastTiles(report, pressureUnit)}
            label={`${label}, whole unit`}
          />
          <section
            aria-label="Forecast accuracy by model"
            className="grid gap-4 lg:grid-cols-2 print:grid-cols-1"
          >
            {report.summary.n > 0 ? (
              <CalibrationChart
                series={calibration.series}
                axisMax={calibration.axisMax}
                unit={pressureUnit}
                id="forecast-accuracy-calibration"
              />
            ) : null}
            <ReportTableView
              table={modelTable(report.summary, pressureUnit)}
              {...common}
              emptyText="No forecast was checked in this period."
            />
          </section>
          <ReportTableView table={deviceTable(report, pressureUnit)} {...common} />
          <ReportTableView table={fio2StepTable(report, pressureUnit)} {...common} />
          <ReportTableView
            table={reasonTable(report)}
            {...common}
            emptyText="Every change in this period was checked."
          />
          <ReportTableView
            table={pairsTable(report, pressureUnit, timeZone)}
            {...common}
            emptyText="No forecast was checked in this period."
          />
          <ReportTableView
            table={uncheckedTable(report, timeZone)}
            {...common}
            emptyText="Every change in this period was checked."
          />
        </>
      )}
      <BasisList basis={report.basis} />
    </ReportFrame>
  );
}

import type {
  AlertsReport,
  Distribution,
  OrdersReport,
  OxygenExposureReport,
  ReportKind,
  ReportOf,
  TimeInBandReport,
} from "./types";
import { formatCell, hours, pct, round, type Cell, type ColumnFormat, type Tile } from "./tables";

const minutesText = (d: Distribution) =>
  d.median === null ? "–" : formatCell(round(d.median, 1), "dec1");

/** The summary tiles of a report: its headline numbers for the whole unit and period. */
export function summaryTiles(kind: ReportKind, report: ReportOf<ReportKind>): Tile[] {
  const show = (v: Cell, f: ColumnFormat) => formatCell(v, f);
  switch (kind) {
    case "time-in-band": {
      const s = (report as TimeInBandReport).summary;
      return [
        {
          key: "inBand",
          label: "In band",
          value: show(pct(s.inBand), "pct"),
          unit: "%",
          tone: "in-band",
        },
        {
          key: "below",
          label: "Below band",
          value: show(pct(s.below), "pct"),
          unit: "%",
          tone: "below",
        },
        {
          key: "above",
          label: "Above band on oxygen",
          value: show(pct(s.above), "pct"),
          unit: "%",
          tone: "above",
        },
        {
          key: "unknown",
          label: "No data",
          value: show(pct(s.unknown), "pct"),
          unit: "%",
          tone: "unknown",
        },
        {
          key: "below85",
          label: "SpO2 below 85 %",
          value: show(s.below85Minutes, "int"),
          unit: "min",
          tone: "neutral",
        },
        {
          key: "patientHours",
          label: "Patient time",
          value: show(hours(s.patientMinutes), "dec1"),
          unit: "h",
          tone: "neutral",
        },
      ];
    }
    case "alerts": {
      const s = (report as AlertsReport).summary;
      return [
        { key: "alerts", label: "Alerts", value: show(s.alerts, "int"), tone: "neutral" },
        {
          key: "perDay",
          label: "Per patient-day",
          value: show(s.alertsPerPatientDay, "dec2"),
          tone: "neutral",
        },
        {
          key: "ack",
          label: "To acknowledge, median",
          value: minutesText(s.toAcknowledge),
          unit: "min",
          tone: "neutral",
        },
        {
          key: "resolve",
          label: "To resolve, median",
          value: minutesText(s.toResolve),
          unit: "min",
          tone: "neutral",
        },
        {
          key: "escalated",
          label: "Escalated",
          value: show(pct(s.escalationRate), "pct"),
          unit: "%",
          tone: "neutral",
        },
      ];
    }
    case "oxygen-exposure": {
      const s = (report as OxygenExposureReport).summary;
      return [
        {
          key: "oxygenHours",
          label: "On oxygen",
          value: show(round(s.oxygenHours, 1), "dec1"),
          unit: "h",
          tone: "neutral",
        },
        {
          key: "fio2Hours",
          label: "FiO2-hours above room air",
          value: show(round(s.fio2HoursAboveRoomAir, 1), "dec1"),
          tone: "neutral",
        },
        {
          key: "fio2At60",
          label: "At FiO2 ≥ 0.6",
          value: show(round(s.hoursAtFio2AtLeast60, 1), "dec1"),
          unit: "h",
          tone: "neutral",
        },
        {
          key: "aboveOnOxygen",
          label: "Above band on oxygen",
          value: show(s.aboveOnOxygenMinutes, "int"),
          unit: "min",
          tone: "above",
        },
        {
          key: "patientDays",
          label: "Patient-days",
          value: show(round(s.patientDays, 1), "dec1"),
          tone: "neutral",
        },
      ];
    }
    case "orders": {
      const s = (report as OrdersReport).summary;
      return [
        { key: "orders", label: "Orders", value: show(s.orders, "int"), tone: "neutral" },
        {
          key: "verbal",
          label: "Verbal or telephone",
          value: show(s.verbalOrders, "int"),
          tone: "neutral",
        },
        {
          key: "cosign",
          label: "To co-sign, median",
          value: minutesText(s.cosignDelay),
          unit: "min",
          tone: "neutral",
        },
        {
          key: "onTime",
          label: "Reassessed on time",
          value: show(pct(s.reassessmentsOnTime), "pct"),
          unit: "%",
          tone: "neutral",
        },
        {
          key: "adjustments",
          label: "Adjustments",
          value: show(s.adjustments, "int"),
          tone: "neutral",
        },
        {
          key: "followed",
          label: "Followed the proposal",
          value: show(pct(s.followedProposal), "pct"),
          unit: "%",
          tone: "neutral",
        },
      ];
    }
  }
}

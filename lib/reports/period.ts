import { REPORT_KINDS, type ReportGroup } from "./types";
import { shiftAt, type ShiftPattern } from "../units/shifts";
import { wallParts, wallTimeToInstant } from "../time/zone";

/**
 * The Reports page's choices, kept in the address: which report, and which
 * period — this shift, the last 24 hours, 7 or 30 days, or custom whole days
 * on the unit's clock. Pure: the page and the tests resolve them the same way.
 */
export const PERIOD_CHOICES = ["shift", "24h", "7d", "30d", "custom"] as const;
export type PeriodChoice = (typeof PERIOD_CHOICES)[number];

export const PERIOD_LABELS: Record<PeriodChoice, string> = {
  shift: "This shift",
  "24h": "24 h",
  "7d": "7 days",
  "30d": "30 days",
  custom: "Custom",
};

/**
 * The reports the page offers: the four grouped reports (REPORT_KINDS, built
 * by loadReport) and forecast accuracy (lib/forecast-accuracy, its own shape).
 */
export const REPORT_PAGES = [...REPORT_KINDS, "forecast-accuracy"] as const;
export type ReportPage = (typeof REPORT_PAGES)[number];

export const REPORT_LABELS: Record<ReportPage, string> = {
  "time-in-band": "Time in band",
  alerts: "Alerts",
  "oxygen-exposure": "Oxygen exposure",
  orders: "Orders and adjustments",
  "forecast-accuracy": "Forecast accuracy",
};

/** The longest custom period, in days: a quarter and a day. */
export const MAX_CUSTOM_DAYS = 92;

const DAY_MS = 86_400_000;
const HOUR_MS = 3_600_000;
const DATE = /^(\d{4})-(\d{2})-(\d{2})$/;

export type ReportSearch = {
  unit?: string | string[];
  report?: string | string[];
  period?: string | string[];
  from?: string | string[];
  to?: string | string[];
};

export type ReportChoice = {
  unitId: number | null;
  report: ReportPage;
  period: PeriodChoice;
  /** Custom days as typed (YYYY-MM-DD), on the unit's clock. */
  fromDay: string | null;
  toDay: string | null;
};

const one = (v: string | string[] | undefined) => (Array.isArray(v) ? v.at(-1) : v);

/** Reads the address; anything unknown falls back to the default (Time in band, 7 days). */
export function parseReportSearch(search: ReportSearch): ReportChoice {
  const unit = Number(one(search.unit));
  const report = one(search.report);
  const period = one(search.period);
  const fromDay = one(search.from);
  const toDay = one(search.to);
  return {
    unitId: Number.isInteger(unit) && unit > 0 ? unit : null,
    report: (REPORT_PAGES as readonly string[]).includes(report ?? "")
      ? (report as ReportPage)
      : "time-in-band",
    period: (PERIOD_CHOICES as readonly string[]).includes(period ?? "")
      ? (period as PeriodChoice)
      : "7d",
    fromDay: fromDay && DATE.test(fromDay) ? fromDay : null,
    toDay: toDay && DATE.test(toDay) ? toDay : null,
  };
}

export type ResolvedPeriod =
  | { ok: true; from: Date; to: Date; overTime: Extract<ReportGroup, "day" | "shift"> }
  | { ok: false; message: string };

function dayStart(day: string, timeZone: string): Date | null {
  const m = DATE.exec(day);
  if (!m) return null;
  const wall = Date.UTC(Number(m[1]), Number(m[2]) - 1, Number(m[3]));
  if (new Date(wall).toISOString().slice(0, 10) !== day) return null;
  return wallTimeToInstant(wall, timeZone);
}

/** The instants a choice covers for a unit at `now`; shorter periods chart by shift, longer by day. */
export function resolvePeriod(
  choice: Pick<ReportChoice, "period" | "fromDay" | "toDay">,
  unit: ShiftPattern,
  now: Date,
): ResolvedPeriod {
  const t = now.getTime();
  switch (choice.period) {
    case "shift":
      return { ok: true, from: shiftAt(unit, now).startsAt, to: now, overTime: "shift" };
    case "24h":
      return { ok: true, from: new Date(t - 24 * HOUR_MS), to: now, overTime: "shift" };
    case "7d":
      return { ok: true, from: new Date(t - 7 * DAY_MS), to: now, overTime: "day" };
    case "30d":
      return { ok: true, from: new Date(t - 30 * DAY_MS), to: now, overTime: "day" };
    case "custom": {
      if (!choice.fromDay || !choice.toDay)
        return { ok: false, message: "Choose the first and the last day of the custom period." };
      const from = dayStart(choice.fromDay, unit.timeZone);
      const lastDay = dayStart(choice.toDay, unit.timeZone);
      if (!from || !lastDay) return { ok: false, message: "A custom day is not a calendar date." };
      const p = wallParts(lastDay, unit.timeZone);
      const end = wallTimeToInstant(Date.UTC(p.year, p.month - 1, p.day + 1), unit.timeZone);
      if (lastDay < from)
        return { ok: false, message: "The last day of the period is before its first day." };
      if (from.getTime() > t) return { ok: false, message: "The period starts in the future." };
      if (end.getTime() - from.getTime() > (MAX_CUSTOM_DAYS + 1) * DAY_MS)
        return { ok: false, message: `A custom period is at most ${MAX_CUSTOM_DAYS} days.` };
      return { ok: true, from, to: end.getTime() > t ? now : end, overTime: "day" };
    }
  }
}

/** The address of a choice (links between reports keep the unit and period). */
export function reportHref(choice: ReportChoice, patch: Partial<ReportChoice> = {}): string {
  const c = { ...choice, ...patch };
  const q = new URLSearchParams();
  if (c.unitId !== null) q.set("unit", String(c.unitId));
  q.set("report", c.report);
  q.set("period", c.period);
  if (c.period === "custom") {
    if (c.fromDay) q.set("from", c.fromDay);
    if (c.toDay) q.set("to", c.toDay);
  }
  return `/reports?${q.toString()}`;
}

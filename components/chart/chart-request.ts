import { ApiRequestError, getApiJson } from "@/components/ui/api-json";

/** The Chart's name for the shared API error. */
export { ApiRequestError as ChartRequestError };

/** GETs JSON from /api/v1 for the Chart's SWR hooks. */
export function getChartJson<T>(url: string): Promise<T> {
  return getApiJson<T>(url, "the Chart");
}

/** A time on the unit's clock: "Tue 08:15" (24-hour), with the date when asked. */
export function formatUnitTime(iso: string | number, timeZone: string, withDate = false): string {
  return new Intl.DateTimeFormat("en-GB", {
    timeZone,
    weekday: withDate ? undefined : "short",
    day: withDate ? "numeric" : undefined,
    month: withDate ? "short" : undefined,
    hour: "2-digit",
    minute: "2-digit",
    hourCycle: "h23",
  }).format(new Date(iso));
}

export const TREND_RANGES = [
  { key: "6h", label: "6 h", hours: 6 },
  { key: "24h", label: "24 h", hours: 24 },
  { key: "72h", label: "72 h", hours: 72 },
  { key: "stay", label: "Stay", hours: null },
] as const;
export type TrendRangeKey = (typeof TREND_RANGES)[number]["key"];

const MAX_SPAN_MS = 31 * 24 * 3600_000;

/** The from/to of a range picked at `now`: the stay starts at admission, at most 31 days back. */
export function rangeBounds(
  key: TrendRangeKey,
  admittedAt: string,
  now: number,
): { from: string; to: string } {
  // Whole minutes, so the request (and SWR's key) is the same for a minute.
  const to = Math.ceil(now / 60_000) * 60_000;
  const range = TREND_RANGES.find((r) => r.key === key) ?? TREND_RANGES[1];
  const from =
    range.hours === null
      ? Math.max(Date.parse(admittedAt), to - MAX_SPAN_MS)
      : to - range.hours * 3600_000;
  return {
    from: new Date(Math.min(from, to - 60_000)).toISOString(),
    to: new Date(to).toISOString(),
  };
}

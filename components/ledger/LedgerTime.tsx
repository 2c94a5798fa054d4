// Times are stored in UTC and shown in the unit's time zone, always with the
// zone named. Intl does the zone arithmetic (lib/time/zone), so no time-zone data ships with us.

import { wallParts, wallTimeToInstant } from "@/lib/time/zone";

const pad = (n: number, width = 2) => String(n).padStart(width, "0");

/** A `datetime-local` value, seconds optional. */
export const LOCAL_DATE_TIME = /^(\d{4})-(\d{2})-(\d{2})T(\d{2}):(\d{2})(?::(\d{2}))?$/;

/**
 * A `datetime-local` value ("2025-03-04T08:00", seconds optional) read as wall-clock time in the
 * zone, as a UTC instant; undefined when it is not such a value. A wall time
 * skipped by a daylight-saving change moves forward by the gap.
 */
export function zonedLocalToUtc(local: string, timeZone: string): Date | undefined {
  const m = LOCAL_DATE_TIME.exec(local);
  if (!m) return undefined;
  const [year, month, day, hour, minute, second] = m.slice(1).map((v) => Number(v ?? 0)) as [
    number,
    number,
    number,
    number,
    number,
    number,
  ];
  if (hour > 23 || minute > 59 || second > 59) return undefined;
  const wall = Date.UTC(year, month - 1, day, hour, minute, second);
  const check = new Date(wall);
  if (
    check.getUTCFullYear() !== year ||
    check.getUTCMonth() !== month - 1 ||
    check.getUTCDate() !== day
  )
    return undefined;
  return wallTimeToInstant(wall, timeZone);
}

/** The instant as a `datetime-local` value in the zone; seconds only when not zero. */
export function utcToZonedLocal(instant: Date, timeZone: string): string {
  const p = wallParts(instant, timeZone);
  const seconds = p.second ? `:${pad(p.second)}` : "";
  return `${pad(p.year, 4)}-${pad(p.month)}-${pad(p.day)}T${pad(p.hour)}:${pad(p.minute)}${seconds}`;
}

/** "2025-03-04" and "14:05:09" in the zone. */
export function formatInZone(instant: Date, timeZone: string): { date: string; time: string } {
  const p = wallParts(instant, timeZone);
  return {
    date: `${pad(p.year, 4)}-${pad(p.month)}-${pad(p.day)}`,
    time: `${pad(p.hour)}:${pad(p.minute)}:${pad(p.second)}`,
  };
}

/** A ledger time: the date, then the time with its zone named, in the unit's zone. */
export function LedgerTime({ iso, timeZone }: { iso: string; timeZone: string }) {
  const { date, time } = formatInZone(new Date(iso), timeZone);
  return (
    <time dateTime={iso} className="tabular block leading-tight">
      <span className="block whitespace-nowrap">{date}</span>
      <span className="block truncate" title={`${date} ${time} ${timeZone}`}>
        <span className="font-medium">{time}</span>{" "}
        <span className="text-xs text-ink-muted">{timeZone}</span>
      </span>
    </time>
  );
}

/**
 * Wall-clock time in a unit's IANA time zone, with no library: the runtime's
 * Intl data answers what a clock in the zone shows at an instant, and the
 * reverse (a typed or imported wall time → the instant) is two passes of that.
 * Pure; used by forms, the ledger filter, the order "as it stood" view and
 * file imports alike.
 */

export type WallParts = {
  year: number;
  month: number;
  day: number;
  hour: number;
  minute: number;
  second: number;
};

const formatters = new Map<string, Intl.DateTimeFormat>();
const offsets = new Map<string, number>();

function formatterFor(timeZone: string): Intl.DateTimeFormat {
  let f = formatters.get(timeZone);
  if (!f) {
    // Throws RangeError for a zone the runtime does not know.
    f = new Intl.DateTimeFormat("en-GB", {
      timeZone,
      hourCycle: "h23",
      year: "numeric",
      month: "2-digit",
      day: "2-digit",
      hour: "2-digit",
      minute: "2-digit",
      second: "2-digit",
    });
    formatters.set(timeZone, f);
  }
  return f;
}

/** Whether the runtime knows this IANA zone name. */
export function isKnownTimeZone(timeZone: string): boolean {
  try {
    formatterFor(timeZone);
    return true;
  } catch {
    return false;
  }
}

/** What a clock in `timeZone` shows at the instant, to the second. */
export function wallParts(instant: Date | number, timeZone: string): WallParts {
  const parts = formatterFor(timeZone).formatToParts(new Date(instant));
  const get = (type: Intl.DateTimeFormatPartTypes) =>
    Number(parts.find((p) => p.type === type)?.value ?? 0);
  return {
    year: get("year"),
    month: get("month"),
    day: get("day"),
    hour: get("hour"),
    minute: get("minute"),
    second: get("second"),
  };
}

/**
 * Milliseconds the zone is ahead of UTC at the instant. Cached per zone and
 * quarter hour (zones change offset only on quarter-hour boundaries), since an
 * imported day of 1 Hz readings asks 86,400 times.
 */
export function zoneOffsetMs(instant: number, timeZone: string): number {
  const key = `${timeZone}|${Math.floor(instant / 900_000)}`;
  const cached = offsets.get(key);
  if (cached !== undefined) return cached;
  const p = wallParts(instant, timeZone);
  const wallAsUtc = Date.UTC(p.year, p.month - 1, p.day, p.hour, p.minute, p.second);
  const offset = wallAsUtc - (instant - (((instant % 1000) + 1000) % 1000));
  if (offsets.size > 10_000) offsets.clear();
  offsets.set(key, offset);
  return offset;
}

/**
 * The instant a wall-clock time names in the zone; `wallMs` is that wall time
 * written as if it were UTC (Date.UTC of its fields). The offset at the wall
 * time is a guess; the offset at the guess is right except across a
 * daylight-saving change, where the second pass settles it (a skipped wall
 * time moves forward by the gap; a repeated one reads as the later).
 */
export function wallTimeToInstant(wallMs: number, timeZone: string): Date {
  const guess = wallMs - zoneOffsetMs(wallMs, timeZone);
  return new Date(wallMs - zoneOffsetMs(guess, timeZone));
}

/** "03 Dec 19:00": an instant as a clock in the unit's zone shows it, to the minute. */
export function formatUnitTime(iso: string, timeZone: string): string {
  return new Intl.DateTimeFormat("en-GB", {
    timeZone,
    day: "2-digit",
    month: "short",
    hour: "2-digit",
    minute: "2-digit",
    hourCycle: "h23",
  }).format(new Date(iso));
}

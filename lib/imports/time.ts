// Times in imported files: ISO 8601 with an offset is taken as it is; a time
// without an offset (what most analysers and monitors write) is read on the
// unit's clock, like times typed into the forms.

import { wallTimeToInstant } from "../time/zone";

/** A wall-clock time on the zone's clock as an instant (the later reading in a DST overlap). */
export function zonedWallTimeToDate(
  wall: {
    year: number;
    month: number;
    day: number;
    hour: number;
    minute: number;
    second: number;
    ms: number;
  },
  timeZone: string,
): Date {
  return wallTimeToInstant(
    Date.UTC(wall.year, wall.month - 1, wall.day, wall.hour, wall.minute, wall.second, wall.ms),
    timeZone,
  );
}

const ISO_LOCAL =
  /^(\d{4})-(\d{2})-(\d{2})[T ](\d{2}):(\d{2})(?::(\d{2})(?:[.,](\d{1,9}))?)?(Z|[+-]\d{2}:?\d{2})?$/;
const HL7_TS = /^(\d{4})(\d{2})(\d{2})(\d{2})(\d{2})(?:(\d{2})(?:\.(\d{1,4}))?)?([+-]\d{4})?$/;

function build(m: RegExpExecArray, zone: string | undefined, timeZone: string): Date | null {
  const [year, month, day, hour, minute] = [m[1], m[2], m[3], m[4], m[5]].map(Number) as [
    number,
    number,
    number,
    number,
    number,
  ];
  const second = m[6] ? Number(m[6]) : 0;
  const ms = m[7] ? Math.round(Number(`0.${m[7]}`) * 1000) : 0;
  if (month < 1 || month > 12 || day < 1 || day > 31 || hour > 23 || minute > 59 || second > 59)
    return null;
  const check = new Date(Date.UTC(year, month - 1, day));
  if (check.getUTCDate() !== day) return null;
  if (zone) {
    if (zone === "Z") return new Date(Date.UTC(year, month - 1, day, hour, minute, second, ms));
    const sign = zone.startsWith("-") ? -1 : 1;
    const digits = zone.slice(1).replace(":", "");
    const offsetMin = Number(digits.slice(0, 2)) * 60 + Number(digits.slice(2, 4));
    return new Date(
      Date.UTC(year, month - 1, day, hour, minute, second, ms) - sign * offsetMin * 60_000,
    );
  }
  return zonedWallTimeToDate({ year, month, day, hour, minute, second, ms }, timeZone);
}

/**
 * Parses "2026-11-20T08:15:00Z", "2026-11-20 08:15:00+01:00", "2026-11-20 08:15"
 * (unit clock) or an HL7 DTM "202611200815[00][+0100]". Null if it is none of these.
 */
export function parseImportTime(text: string, timeZone: string): Date | null {
  const t = text.trim();
  const iso = ISO_LOCAL.exec(t);
  if (iso) return build(iso, iso[8], timeZone);
  const hl7 = HL7_TS.exec(t);
  if (hl7) return build(hl7, hl7[8], timeZone);
  return null;
}

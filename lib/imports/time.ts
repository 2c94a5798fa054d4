// Times in imported files: ISO 8601 with an offset is taken as it is; a time
// without an offset (what most analysers and monitors write) is read on the
// unit's clock, like times typed into the forms.

const formatters = new Map<string, Intl.DateTimeFormat>();
const offsets = new Map<string, number>();

function formatterFor(timeZone: string): Intl.DateTimeFormat {
  let f = formatters.get(timeZone);
  if (!f) {
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

/** The zone's offset from UTC in ms at an instant, cached per zone and quarter hour. */
function offsetAt(timeZone: string, instant: number): number {
  const key = `${timeZone}|${Math.floor(instant / 900_000)}`;
  const cached = offsets.get(key);
  if (cached !== undefined) return cached;
  const parts = Object.fromEntries(
    formatterFor(timeZone)
      .formatToParts(new Date(instant))
      .map((p) => [p.type, p.value]),
  );
  const asUtc = Date.UTC(
    Number(parts.year),
    Number(parts.month) - 1,
    Number(parts.day),
    Number(parts.hour),
    Number(parts.minute),
    Number(parts.second),
  );
  const offset = asUtc - Math.floor(instant / 1000) * 1000;
  if (offsets.size > 10_000) offsets.clear();
  offsets.set(key, offset);
  return offset;
}

/** A wall-clock time on the zone's clock as an instant (the later reading in a DST overlap). */
export function zonedWallTimeToDate(
  wall: { year: number; month: number; day: number; hour: number; minute: number; second: number; ms: number },
  timeZone: string,
): Date {
  const guess = Date.UTC(wall.year, wall.month - 1, wall.day, wall.hour, wall.minute, wall.second, wall.ms);
  let instant = guess - offsetAt(timeZone, guess);
  instant = guess - offsetAt(timeZone, instant);
  return new Date(instant);
}

const ISO_LOCAL =
  /^(\d{4})-(\d{2})-(\d{2})[T ](\d{2}):(\d{2})(?::(\d{2})(?:[.,](\d{1,9}))?)?(Z|[+-]\d{2}:?\d{2})?$/;
const HL7_TS = /^(\d{4})(\d{2})(\d{2})(\d{2})(\d{2})(?:(\d{2})(?:\.(\d{1,4}))?)?([+-]\d{4})?$/;

function build(
  m: RegExpExecArray,
  zone: string | undefined,
  timeZone: string,
): Date | null {
  const [year, month, day, hour, minute] = [m[1], m[2], m[3], m[4], m[5]].map(Number) as [
    number,
    number,
    number,
    number,
    number,
  ];
  const second = m[6] ? Number(m[6]) : 0;
  const ms = m[7] ? Math.round(Number(`0.${m[7]}`) * 1000) : 0;
  if (month < 1 || month > 12 || day < 1 || day > 31 || hour > 23 || minute > 59 || second > 59) return null;
  const check = new Date(Date.UTC(year, month - 1, day));
  if (check.getUTCDate() !== day) return null;
  if (zone) {
    if (zone === "Z") return new Date(Date.UTC(year, month - 1, day, hour, minute, second, ms));
    const sign = zone.startsWith("-") ? -1 : 1;
    const digits = zone.slice(1).replace(":", "");
    const offsetMin = Number(digits.slice(0, 2)) * 60 + Number(digits.slice(2, 4));
    return new Date(Date.UTC(year, month - 1, day, hour, minute, second, ms) - sign * offsetMin * 60_000);
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

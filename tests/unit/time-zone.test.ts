import { describe, expect, it } from "vitest";
import { isKnownTimeZone, wallParts, wallTimeToInstant, zoneOffsetMs } from "@/lib/time/zone";

// EU summer time starts and ends at 01:00 UTC on the last Sunday of March and
// of October (EU Directive 2000/84/EC): 29 Mar and 25 Oct in 2026.
const LONDON = "Europe/London";

describe("lib/time/zone", () => {
  it("gives the zone's offset on either side of a clock change", () => {
    expect(zoneOffsetMs(Date.UTC(2026, 2, 29, 0, 59), LONDON)).toBe(0);
    expect(zoneOffsetMs(Date.UTC(2026, 2, 29, 1, 0), LONDON)).toBe(3600_000);
    expect(zoneOffsetMs(Date.UTC(2026, 9, 25, 0, 59), LONDON)).toBe(3600_000);
    expect(zoneOffsetMs(Date.UTC(2026, 9, 25, 1, 0), LONDON)).toBe(0);
  });

  it("reads a wall time as the instant it names, across both changes", () => {
    expect(wallTimeToInstant(Date.UTC(2026, 6, 1, 14, 5), LONDON).toISOString()).toBe(
      "2026-07-01T13:05:00.000Z",
    );
    expect(wallTimeToInstant(Date.UTC(2026, 0, 1, 14, 5), LONDON).toISOString()).toBe(
      "2026-01-01T14:05:00.000Z",
    );
    // 01:30 does not exist on 29 March: it moves forward by the gap.
    expect(wallTimeToInstant(Date.UTC(2026, 2, 29, 1, 30), LONDON).toISOString()).toBe(
      "2026-03-29T01:30:00.000Z",
    );
    // 01:30 happens twice on 25 October: the later one.
    expect(wallTimeToInstant(Date.UTC(2026, 9, 25, 1, 30), LONDON).toISOString()).toBe(
      "2026-10-25T01:30:00.000Z",
    );
  });

  it("shows the wall clock of an instant and knows which zones exist", () => {
    expect(wallParts(new Date("2026-07-01T13:05:09Z"), LONDON)).toEqual({
      year: 2026,
      month: 7,
      day: 1,
      hour: 14,
      minute: 5,
      second: 9,
    });
    expect(isKnownTimeZone(LONDON)).toBe(true);
    expect(isKnownTimeZone("Mars/Olympus_Mons")).toBe(false);
  });
});

import { describe, expect, it } from "vitest";
import { nextShift, previousShift, resolveShift, shiftAt } from "@/lib/units/shifts";

const utc12 = { timeZone: "UTC", shiftStart: "07:00", shiftHours: 12 } as const;

describe("a unit's shifts", () => {
  it("cuts a UTC day at 07:00 and 19:00", () => {
    const day = shiftAt(utc12, new Date("2026-12-03T10:00:00Z"));
    expect(day.startsAt.toISOString()).toBe("2026-12-03T07:00:00.000Z");
    expect(day.endsAt.toISOString()).toBe("2026-12-03T19:00:00.000Z");
    const night = shiftAt(utc12, new Date("2026-12-03T03:00:00Z"));
    expect(night.startsAt.toISOString()).toBe("2026-12-02T19:00:00.000Z");
    expect(night.endsAt.toISOString()).toBe("2026-12-03T07:00:00.000Z");
  });

  it("puts the start instant in the shift it starts, not the one it ends", () => {
    const s = shiftAt(utc12, new Date("2026-12-03T19:00:00Z"));
    expect(s.startsAt.toISOString()).toBe("2026-12-03T19:00:00.000Z");
  });

  it("steps to the next and previous shift", () => {
    const s = shiftAt(utc12, new Date("2026-12-03T10:00:00Z"));
    expect(nextShift(utc12, s).startsAt.toISOString()).toBe("2026-12-03T19:00:00.000Z");
    expect(previousShift(utc12, s).startsAt.toISOString()).toBe("2026-12-02T19:00:00.000Z");
  });

  it("follows the unit's wall clock across a daylight-saving change (Europe/Berlin, 2026-03-29)", () => {
    const berlin = { timeZone: "Europe/Berlin", shiftStart: "07:00", shiftHours: 12 } as const;
    // The night shift that spans the change is an hour shorter: 19:00 CET → 07:00 CEST.
    const night = shiftAt(berlin, new Date("2026-03-29T01:30:00Z"));
    expect(night.startsAt.toISOString()).toBe("2026-03-28T18:00:00.000Z");
    expect(night.endsAt.toISOString()).toBe("2026-03-29T05:00:00.000Z");
  });

  it("cuts eight-hour shifts from a 06:30 start", () => {
    const p = { timeZone: "UTC", shiftStart: "06:30", shiftHours: 8 } as const;
    expect(shiftAt(p, new Date("2026-12-03T23:59:00Z")).startsAt.toISOString()).toBe(
      "2026-12-03T22:30:00.000Z",
    );
    expect(shiftAt(p, new Date("2026-12-03T06:00:00Z")).startsAt.toISOString()).toBe(
      "2026-12-02T22:30:00.000Z",
    );
  });

  it("resolves current, next and a named start, and refuses a time that is not a start", () => {
    const now = new Date("2026-12-03T10:00:00Z");
    expect(resolveShift(utc12, "next", now)!.startsAt.toISOString()).toBe(
      "2026-12-03T19:00:00.000Z",
    );
    expect(resolveShift(utc12, new Date("2026-12-04T07:00:00Z"), now)).not.toBeNull();
    expect(resolveShift(utc12, new Date("2026-12-04T08:00:00Z"), now)).toBeNull();
  });
});

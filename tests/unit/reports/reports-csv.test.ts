import Papa from "papaparse";
import { describe, expect, it } from "vitest";
import { csvFileName, tableToCsv } from "@/lib/reports/csv";
import { parseReportSearch, resolvePeriod } from "@/lib/reports/period";
import { groupTable } from "@/lib/reports/tables";
import { fixtureReport, PERIOD } from "../../fixtures/reports";

describe("tableToCsv", () => {
  const table = groupTable(
    "time-in-band",
    fixtureReport("time-in-band", "patient"),
    "patient",
    "Time in band by patient",
  );

  it("starts with a line naming the report, unit, period on the unit's clock and when it was generated", () => {
    const lines = tableToCsv(table, PERIOD, "Time in band").split("\r\n");
    expect(lines[0]).toBe(
      '"Time in band: Time in band by patient, MICU (Medical ICU), 2026-11-26 07:00 to 2026-12-03 07:00 (Europe/Oslo), generated 2026-12-03 07:00"',
    );
    expect(lines[1]).toBe(
      "Patient,Bed,Patient time (h),In band (%),Below (%),Above on oxygen (%),No data (%),SpO2 < 88 % (min),SpO2 < 85 % (min),Area below band (%·min),Lowest SpO2 (%),Gases above PaO2 band",
    );
    expect(lines[2]).toBe('"Testcase, Iris 1",M01,24,80,10,5,5,30,12,250,82,0 of 3');
    expect(lines).toHaveLength(6); // three rows and the closing line break
  });

  it("writes an empty field for a missing value and defuses text a spreadsheet would run", () => {
    const report = fixtureReport("time-in-band", "patient", 1);
    report.rows[0] = { ...report.rows[0]!, label: '=HYPERLINK("x")', minSpo2: null };
    const csv = tableToCsv(
      groupTable("time-in-band", report, "patient", "T"),
      PERIOD,
      "Time in band",
    );
    const rows = Papa.parse<string[]>(csv.trim()).data;
    expect(rows[2]![0]).toBe('\'=HYPERLINK("x")');
    expect(rows[2]![10]).toBe("");
  });

  it("names the file after the table, unit and first day", () => {
    expect(csvFileName(table, PERIOD)).toBe("tidemark-time-in-band-patient-MICU-2026-11-26.csv");
  });
});

describe("the period choice", () => {
  const unit = { timeZone: "Europe/Oslo", shiftStart: "07:00", shiftHours: 12 as const };
  const now = new Date("2026-12-03T10:00:00Z");

  it("defaults to 7 days of time in band and ignores unknown values", () => {
    expect(parseReportSearch({ report: "nope", period: "1y" })).toEqual({
      unitId: null,
      report: "time-in-band",
      period: "7d",
      fromDay: null,
      toDay: null,
    });
  });

  it("resolves this shift on the unit's clock, and 7 days by day", () => {
    const shift = resolvePeriod({ period: "shift", fromDay: null, toDay: null }, unit, now);
    expect(shift).toEqual({
      ok: true,
      from: new Date("2026-12-03T06:00:00Z"),
      to: now,
      overTime: "shift",
    });
    const week = resolvePeriod({ period: "7d", fromDay: null, toDay: null }, unit, now);
    expect(week).toMatchObject({
      ok: true,
      from: new Date("2026-11-26T10:00:00Z"),
      overTime: "day",
    });
  });

  it("reads custom whole days on the unit's clock and refuses a reversed or too long one", () => {
    expect(
      resolvePeriod({ period: "custom", fromDay: "2026-11-01", toDay: "2026-11-02" }, unit, now),
    ).toEqual({
      ok: true,
      from: new Date("2026-10-31T23:00:00Z"),
      to: new Date("2026-11-02T23:00:00Z"),
      overTime: "day",
    });
    expect(
      resolvePeriod({ period: "custom", fromDay: "2026-11-02", toDay: "2026-11-01" }, unit, now),
    ).toMatchObject({ ok: false });
    expect(
      resolvePeriod({ period: "custom", fromDay: "2026-01-01", toDay: "2026-11-01" }, unit, now),
    ).toMatchObject({ ok: false });
    expect(
      resolvePeriod({ period: "custom", fromDay: "2026-02-30", toDay: "2026-03-01" }, unit, now),
    ).toMatchObject({ ok: false });
  });
});

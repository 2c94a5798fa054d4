import { describe, expect, it } from "vitest";
import type { Stay } from "@/lib/rollups/stays";
import { makeGrouper, timeSlots } from "@/lib/reports/groups";
import { orderAt, type OrderSpan } from "@/lib/reports/orders";
import { makeLocator, staySegments } from "@/lib/reports/stays";
import { timeInBandRows, timeMeasures } from "@/lib/reports/time-in-band";
import { exposureMeasures } from "@/lib/reports/exposure";
import { at, H, manual, names, piecesOf } from "./fixture";

// Unit 1, UTC, 6-hour shifts from 07:00; the period is 07:00–19:00 on 1 Dec.
//
// Admission 1 (patient 10, bed 1): on unit 1 from 06:00, moved to unit 2 at
// 13:00. One manual reading, SpO2 86 on FiO2 0.5 at 07:00 (band 92–96), holds
// 4 h: 240 min below (area 6 × 240 = 1440 %·min, all under 88), then 120 min
// unknown. A reading of 80 at 14:00 is unit 2's.
//
// Admission 2 (patient 20, bed 2): from 09:00. Band 92–96 until 11:00, then
// 88–92 (order superseded). Readings: 95 at 09:00 (in band), 90 at 10:00
// (below 92: 60 min, area 2 × 60 = 120), held past 11:00 into the new band
// (in band), 94 on room air at 12:00 (above 92 but no oxygen: in band), 94 on
// FiO2 0.4 at 13:00 (above on oxygen until 17:00), nothing after 17:00.
const pattern = { timeZone: "UTC", shiftStart: "07:00", shiftHours: 6 } as const;
const from = at("07:00");
const to = at("19:00");
const stays: Stay[] = [
  { admissionId: 1, patientId: 10, bedId: 100, unitId: 1, from: at("06:00"), to: at("13:00") },
  { admissionId: 1, patientId: 10, bedId: 900, unitId: 2, from: at("13:00"), to: Infinity },
  { admissionId: 2, patientId: 20, bedId: 101, unitId: 1, from: at("09:00"), to: Infinity },
];
const pieces = [
  ...piecesOf(
    {
      admissionId: 1,
      series: [manual(at("07:00"), 86, 0.5), manual(at("14:00"), 80, 0.5)],
      bands: [{ from: new Date(at("05:00")), to: null, lower: 92, upper: 96 }],
    },
    stays,
    1,
    from,
    to,
  ),
  ...piecesOf(
    {
      admissionId: 2,
      series: [
        manual(at("09:00"), 95),
        manual(at("10:00"), 90),
        manual(at("12:00"), 94),
        manual(at("13:00"), 94, 0.4),
      ],
      bands: [
        { from: new Date(at("08:00")), to: new Date(at("11:00")), lower: 92, upper: 96 },
        { from: new Date(at("11:00")), to: null, lower: 88, upper: 92 },
      ],
    },
    stays,
    1,
    from,
    to,
  ),
];
const span = (id: number, a: number, b: number, pao2Upper: number | null): OrderSpan => ({
  id,
  admissionId: 2,
  from: a,
  to: b,
  entryMode: "written",
  createdAt: a,
  cosignedAt: null,
  reassessMinutes: 60,
  pao2Upper,
});
// Order 1 (PaO2 band up to 100) superseded at 11:00 by order 2 (no PaO2 band).
const spans = [span(1, at("08:00"), at("11:00"), 100), span(2, at("11:00"), Infinity, null)];
const gases = [
  { admissionId: 2, at: at("10:30"), pao2: 120 },
  { admissionId: 2, at: at("12:00"), pao2: 130 },
  { admissionId: 1, at: at("14:00"), pao2: 140 },
].map((g) => ({ ...g, pao2Upper: orderAt(spans, g.admissionId, g.at)?.pao2Upper ?? null }));

function report(groupBy: "patient" | "bed" | "shift" | "day") {
  const slots =
    groupBy === "shift" || groupBy === "day" ? timeSlots(pattern, groupBy, from, to) : [];
  const segments = staySegments(stays, 1, from, to, slots);
  const out = timeInBandRows({
    segments,
    pieces,
    gases,
    group: makeGrouper(groupBy, slots, names),
    locate: makeLocator(segments),
    from,
    to,
    always: slots.map((s) => ({ key: s.key, label: s.label, startsAt: s.startsAt })),
  });
  return {
    summary: timeMeasures(out.summary),
    rows: out.rows.map((r) => ({ ...r.key, ...timeMeasures(r.acc) })),
    exposure: exposureMeasures(out.summary),
  };
}

describe("time in band for one unit", () => {
  it("sums the period: only the unit's time, unknown as the rest", () => {
    const { summary } = report("patient");
    expect(summary).toMatchObject({
      patientMinutes: 960,
      belowMinutes: 300,
      inBandMinutes: 180,
      aboveMinutes: 240,
      unknownMinutes: 240,
      below: 0.3125,
      inBand: 0.1875,
      above: 0.25,
      unknown: 0.25,
      below88Minutes: 240,
      below85Minutes: 0,
      belowAreaPctMin: 1560,
      minSpo2: 86,
    });
  });

  it("counts arterial gases against the PaO2 band of the order in effect at sampling", () => {
    // 10:30 under order 1 (upper 100): above. 12:00 under order 2: no band. 14:00: unit 2.
    const { summary } = report("patient");
    expect(summary.gasesWithPao2Band).toBe(1);
    expect(summary.gasesAbovePao2Band).toBe(1);
  });

  it("cuts rows at shift boundaries", () => {
    const { rows } = report("shift");
    expect(rows.map((r) => r.startsAt)).toEqual([
      "2026-12-01T07:00:00.000Z",
      "2026-12-01T13:00:00.000Z",
    ]);
    expect(rows[0]).toMatchObject({
      label: "Shift from 2026-12-01 07:00",
      patientMinutes: 600,
      belowMinutes: 300,
      inBandMinutes: 180,
      aboveMinutes: 0,
      unknownMinutes: 120,
    });
    expect(rows[1]).toMatchObject({
      patientMinutes: 360,
      belowMinutes: 0,
      inBandMinutes: 0,
      aboveMinutes: 240,
      unknownMinutes: 120,
    });
  });

  it("gives one row per patient and per bed", () => {
    const byPatient = report("patient").rows;
    expect(byPatient.map((r) => [r.label, r.bedLabel, r.patientMinutes, r.belowMinutes])).toEqual([
      ["Ames, Ada", "1", 360, 240],
      ["Brook, Ben", "2", 600, 60],
    ]);
    expect(byPatient[0]!.patientId).toBe(10);
    const byBed = report("bed").rows;
    expect(byBed.map((r) => [r.label, r.aboveMinutes])).toEqual([
      ["Bed 1", 0],
      ["Bed 2", 240],
    ]);
  });

  it("gives one day row from the first shift start", () => {
    const { rows } = report("day");
    expect(rows).toHaveLength(1);
    expect(rows[0]).toMatchObject({ label: "Day of 2026-12-01", patientMinutes: 960 });
  });

  it("reads oxygen exposure from the same sums", () => {
    // No applied settings were given: the exposure is the stays and the time above on oxygen.
    expect(report("patient").exposure).toEqual({
      patientDays: round4(960 / 1440),
      oxygenHours: 0,
      fio2HoursAboveRoomAir: 0,
      hoursAtFio2AtLeast60: 0,
      aboveOnOxygenMinutes: 240,
    });
    void H;
  });
});

const round4 = (x: number) => Math.round(x * 1e4) / 1e4;

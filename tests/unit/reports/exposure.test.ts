import { describe, expect, it } from "vitest";
import type { Stay } from "@/lib/rollups/stays";
import { exposureMeasures } from "@/lib/reports/exposure";
import { makeGrouper, timeSlots } from "@/lib/reports/groups";
import { makeLocator, staySegments } from "@/lib/reports/stays";
import { timeInBandRows } from "@/lib/reports/time-in-band";
import { at, manual, names, piecesOf } from "./fixture";

// One admission on unit 1 all day. A Venturi-mask order from 08:00 starts at
// FiO2 0.41; an adjustment at 10:00 sets 0.61, one at 11:00 sets 0.21 (room
// air). The order is discontinued at 12:00. Period 07:00–13:00, 3-hour shifts.
// Oxygen counts only while the SpO2 series is known: from the first reading at 09:00.
//   on oxygen: 09:00–11:00 = 2 h (08:00–09:00 nobody charted)
//   FiO2-hours: 1 h × 0.20 + 1 h × 0.40 = 0.6
//   at FiO2 ≥ 0.6: 10:00–11:00 = 1 h
// SpO2 99 charted at 09:00 on FiO2 0.41, band 88–92: above on oxygen until
// the 94 on room air at 11:00 (in band: no oxygen) → 120 min above.
const pattern = { timeZone: "UTC", shiftStart: "07:00", shiftHours: 6 } as const;
const from = at("07:00");
const to = at("13:00");
const stays: Stay[] = [
  { admissionId: 5, patientId: 10, bedId: 100, unitId: 1, from: at("00:00"), to: Infinity },
];
const pieces = piecesOf(
  {
    admissionId: 5,
    series: [manual(at("09:00"), 99, 0.41), manual(at("11:00"), 94, 0.21)],
    bands: [{ from: new Date(at("08:00")), to: new Date(at("12:00")), lower: 88, upper: 92 }],
    orders: [
      {
        from: at("08:00"),
        to: at("12:00"),
        device: "venturi_mask",
        initialFio2: 0.41,
        initialFlow: null,
      },
    ],
    changes: [
      { at: at("10:00"), fio2: 0.61 },
      { at: at("11:00"), fio2: 0.21 },
    ],
  },
  stays,
  1,
  from,
  to,
);

function rows(groupBy: "shift" | "patient") {
  const slots =
    groupBy === "shift" ? timeSlots({ ...pattern, shiftHours: 6 }, "shift", from, to) : [];
  const segments = staySegments(stays, 1, from, to, slots);
  return timeInBandRows({
    segments,
    pieces,
    gases: [],
    group: makeGrouper(groupBy, slots, names),
    locate: makeLocator(segments),
    from,
    to,
  });
}

describe("oxygen exposure", () => {
  it("integrates the applied FiO2 above room air", () => {
    expect(exposureMeasures(rows("patient").summary)).toEqual({
      patientDays: 0.25,
      oxygenHours: 2,
      fio2HoursAboveRoomAir: 0.6,
      hoursAtFio2AtLeast60: 1,
      aboveOnOxygenMinutes: 120,
    });
  });

  it("splits by shift", () => {
    // 6-hour shifts from 07:00: the whole period is one shift.
    const r = rows("shift").rows;
    expect(r).toHaveLength(1);
    expect(exposureMeasures(r[0]!.acc).oxygenHours).toBe(2);
  });
});

import { describe, expect, it } from "vitest";
import {
  classifySpo2,
  manualCarryMs,
  MAX_CARRY_FORWARD_MS,
  monitorCarryMs,
  timeInBand,
  timeInBandOfSeries,
  type BandReading,
} from "@/lib/time-in-band";

const t = (hhmm: string) => new Date(`2026-11-30T${hhmm}:00.000Z`);
const MIN = 60_000;
const S = 1000;
/** A charted value (invented). */
const manual = (at: Date, spo2: number, fio2: number, flow: number | null = null): BandReading => ({
  at,
  spo2,
  fio2,
  flow,
  source: "manual",
});
/** A monitor series from `start`, one sample every `stepMs` (invented). */
const monitor = (start: Date, values: number[], stepMs = S, fio2 = 0.4): BandReading[] =>
  values.map((spo2, i) => ({
    at: new Date(start.getTime() + i * stepMs),
    spo2,
    fio2,
    flow: null,
    source: "monitor",
  }));

describe("timeInBand", () => {
  it("matches a hand-computed fixture with a band change mid-period", () => {
    // Period 08:00–17:00 = 540 min.
    // Order A (92–96 %) 07:00–11:00, then order B (88–92 %) from 11:00, still in effect.
    const result = timeInBand({
      from: t("08:00"),
      to: t("17:00"),
      bands: [
        { from: t("11:00"), to: null, lower: 88, upper: 92 },
        { from: t("07:00"), to: t("11:00"), lower: 92, upper: 96 },
      ],
      readings: [
        // 06:00, 90 % → carried in, holds to the 08:30 reading: 08:00–08:30 under A, 90 < 92 → below 30 min.
        manual(t("06:00"), 90, 0.4),
        // 08:30, 94 % → to 10:00 under A, 92 ≤ 94 ≤ 96 → in band 90 min.
        manual(t("08:30"), 94, 0.4),
        // 10:00, 98 % on FiO2 0.40 → to 12:00: 10:00–11:00 under A (98 > 96) above 60 min,
        //   11:00–12:00 under B (98 > 92) above 60 min → above 120 min.
        manual(t("10:00"), 98, 0.4),
        // 12:00, 97 % on room air (FiO2 0.21) → to 12:30: above the band but not on oxygen → in band 30 min.
        manual(t("12:00"), 97, 0.21),
        // 12:30, 87 % → no next reading: holds 4 h to 16:30 under B (87 < 88) → below 240 min;
        //   16:30–17:00 nothing holds → unknown 30 min.
        manual(t("12:30"), 87, 0.3),
      ],
    });
    // below 30 + 240 = 270 min; in band 90 + 30 = 120 min; above 120 min; unknown 30 min; total 540.
    expect(result.ms).toEqual({
      period: 540 * MIN,
      below: 270 * MIN,
      inBand: 120 * MIN,
      above: 120 * MIN,
      unknown: 30 * MIN,
    });
    expect(result.below).toBeCloseTo(270 / 540, 10); // 0.5
    expect(result.inBand).toBeCloseTo(120 / 540, 10); // 0.222…
    expect(result.above).toBeCloseTo(120 / 540, 10); // 0.222…
    expect(result.unknown).toBeCloseTo(30 / 540, 10); // 0.0555…
  });

  it("counts the whole period as unknown when there are no readings", () => {
    const r = timeInBand({
      from: t("08:00"),
      to: t("10:00"),
      readings: [],
      bands: [{ from: t("00:00"), to: null, lower: 92, upper: 96 }],
    });
    expect(r).toMatchObject({ below: 0, inBand: 0, above: 0, unknown: 1 });
  });

  it("counts time without an order in effect as unknown", () => {
    // Reading at 08:00 holds to 10:00; the order starts at 09:00 → 1 h unknown, 1 h in band.
    const r = timeInBand({
      from: t("08:00"),
      to: t("10:00"),
      readings: [manual(t("08:00"), 94, 0.3)],
      bands: [{ from: t("09:00"), to: null, lower: 92, upper: 96 }],
    });
    expect(r.inBand).toBeCloseTo(0.5, 10);
    expect(r.unknown).toBeCloseTo(0.5, 10);
  });

  it("carries a reading from before the period in, but not beyond the carry-forward limit", () => {
    const bands = [{ from: t("00:00"), to: null, lower: 92, upper: 96 }];
    // 05:00 + 4 h = 09:00: of the period 08:00–10:00, one hour is below, one unknown.
    const carried = timeInBand({
      from: t("08:00"),
      to: t("10:00"),
      readings: [manual(t("05:00"), 85, 0.5)],
      bands,
    });
    expect(carried.ms.below).toBe(60 * MIN);
    expect(carried.ms.unknown).toBe(60 * MIN);
    // 03:00 + 4 h = 07:00, before the period: nothing carries in.
    const stale = timeInBand({
      from: t("08:00"),
      to: t("10:00"),
      readings: [manual(t("03:00"), 85, 0.5)],
      bands,
    });
    expect(stale.unknown).toBe(1);
    expect(MAX_CARRY_FORWARD_MS).toBe(4 * 60 * MIN);
  });

  it("ignores readings after the period and answers zeros for an empty period", () => {
    const bands = [{ from: t("00:00"), to: null, lower: 92, upper: 96 }];
    const after = timeInBand({
      from: t("08:00"),
      to: t("09:00"),
      readings: [manual(t("09:30"), 94, 0.3)],
      bands,
    });
    expect(after.unknown).toBe(1);
    const empty = timeInBand({ from: t("08:00"), to: t("08:00"), readings: [], bands });
    expect(empty).toMatchObject({ below: 0, inBand: 0, above: 0, unknown: 0 });
  });

  it("takes readings in any order", () => {
    const bands = [{ from: t("00:00"), to: null, lower: 92, upper: 96 }];
    const readings = [manual(t("09:00"), 90, 0.3), manual(t("08:00"), 94, 0.3)];
    const r = timeInBand({ from: t("08:00"), to: t("10:00"), readings, bands });
    expect(r.inBand).toBeCloseTo(0.5, 10);
    expect(r.below).toBeCloseTo(0.5, 10);
  });
});

describe("timeInBandOfSeries", () => {
  it("answers the same as timeInBand for sorted readings in milliseconds", () => {
    const bands = [
      { from: t("07:00"), to: t("11:00"), lower: 92, upper: 96 },
      { from: t("11:00"), to: null, lower: 88, upper: 92 },
    ];
    const readings = [
      manual(t("06:00"), 90, 0.4),
      manual(t("10:00"), 98, 0.4),
      manual(t("12:30"), 87, 0.3),
    ];
    const viaDates = timeInBand({ readings, bands, from: t("08:00"), to: t("17:00") });
    const viaSeries = timeInBandOfSeries({
      series: readings.map(({ at, ...r }) => ({ ...r, t: at.getTime() })),
      bands,
      from: t("08:00").getTime(),
      to: t("17:00").getTime(),
    });
    expect(viaSeries).toEqual(viaDates);
  });
});

describe("honest gaps", () => {
  const bands = [{ from: t("00:00"), to: null, lower: 92, upper: 96 }];

  it("counts a 3-hour gap in a 1 Hz monitor series as unknown, not in band", () => {
    // 08:00:00–08:00:59 in band at 1 Hz, then silence until 11:00, then another minute.
    const readings = [
      ...monitor(t("08:00"), Array<number>(60).fill(94)),
      ...monitor(t("11:00"), Array<number>(60).fill(94)),
    ];
    const r = timeInBand({ from: t("08:00"), to: t("11:01"), readings, bands });
    // Each sample holds until the next; the last of the first minute holds 3 intervals (3 s).
    expect(r.ms.inBand).toBe((59 + 3 + 60) * S);
    expect(r.ms.unknown).toBe(181 * MIN - (59 + 3 + 60) * S);
    expect(r.unknown).toBeGreaterThan(0.98);
  });

  it("lets a sparse monitor series hold three intervals, at most 5 minutes", () => {
    expect(monitorCarryMs(S)).toBe(3 * S);
    expect(monitorCarryMs(60 * S)).toBe(3 * MIN);
    expect(monitorCarryMs(4 * MIN)).toBe(5 * MIN);
    // No previous sample: the interval is unknown and the sample holds 5 minutes.
    expect(monitorCarryMs(null)).toBe(5 * MIN);
    // One sample a minute, the last one at 08:02 holding to 08:05.
    const r = timeInBand({
      from: t("08:00"),
      to: t("09:00"),
      readings: monitor(t("08:00"), [90, 90, 90], MIN),
      bands,
    });
    expect(r.ms.below).toBe(5 * MIN);
    expect(r.ms.unknown).toBe(55 * MIN);
  });

  it("lets a charted value hold for the order's reassessment interval, at most 4 h", () => {
    expect(manualCarryMs(60)).toBe(60 * MIN);
    expect(manualCarryMs(480)).toBe(MAX_CARRY_FORWARD_MS);
    expect(manualCarryMs(null)).toBe(MAX_CARRY_FORWARD_MS);
    const hourly = [{ ...bands[0]!, reassessMinutes: 60 }];
    const r = timeInBand({
      from: t("08:00"),
      to: t("12:00"),
      readings: [manual(t("08:00"), 94, 0.3)],
      bands: hourly,
    });
    expect(r.ms.inBand).toBe(60 * MIN);
    expect(r.ms.unknown).toBe(180 * MIN);
  });
});

describe("classifySpo2", () => {
  const band = { lower: 88, upper: 92 };
  it("treats above the band on room air as in band, and on oxygen (FiO2 > 0.21 or any flow) as above", () => {
    expect(classifySpo2(97, { fio2: 0.21 }, band)).toBe("inBand");
    expect(classifySpo2(97, { fio2: 0.21, flow: null }, band)).toBe("inBand");
    expect(classifySpo2(97, { fio2: 0.22 }, band)).toBe("above");
    expect(classifySpo2(97, { fio2: 0.21, flow: 2 }, band)).toBe("above");
  });
  it("treats the bounds themselves as in band, and every value down to 0 % below", () => {
    expect(classifySpo2(88, { fio2: 0.4 }, band)).toBe("inBand");
    expect(classifySpo2(92, { fio2: 0.4 }, band)).toBe("inBand");
    expect(classifySpo2(87.9, { fio2: 0.4 }, band)).toBe("below");
    expect(classifySpo2(0, { fio2: 0.4 }, band)).toBe("below");
  });
});

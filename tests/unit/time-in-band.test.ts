import { describe, expect, it } from "vitest";
import {
  classifySpo2,
  MAX_CARRY_FORWARD_MS,
  timeInBand,
  timeInBandOfSeries,
} from "@/lib/time-in-band";

const t = (hhmm: string) => new Date(`2026-11-30T${hhmm}:00.000Z`);
const MIN = 60_000;

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
        { at: t("06:00"), spo2: 90, fio2: 0.4 },
        // 08:30, 94 % → to 10:00 under A, 92 ≤ 94 ≤ 96 → in band 90 min.
        { at: t("08:30"), spo2: 94, fio2: 0.4 },
        // 10:00, 98 % on FiO2 0.40 → to 12:00: 10:00–11:00 under A (98 > 96) above 60 min,
        //   11:00–12:00 under B (98 > 92) above 60 min → above 120 min.
        { at: t("10:00"), spo2: 98, fio2: 0.4 },
        // 12:00, 97 % on room air (FiO2 0.21) → to 12:30: above the band but not on oxygen → in band 30 min.
        { at: t("12:00"), spo2: 97, fio2: 0.21 },
        // 12:30, 87 % → no next reading: holds 4 h to 16:30 under B (87 < 88) → below 240 min;
        //   16:30–17:00 nothing holds → unknown 30 min.
        { at: t("12:30"), spo2: 87, fio2: 0.3 },
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
      readings: [{ at: t("08:00"), spo2: 94, fio2: 0.3 }],
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
      readings: [{ at: t("05:00"), spo2: 85, fio2: 0.5 }],
      bands,
    });
    expect(carried.ms.below).toBe(60 * MIN);
    expect(carried.ms.unknown).toBe(60 * MIN);
    // 03:00 + 4 h = 07:00, before the period: nothing carries in.
    const stale = timeInBand({
      from: t("08:00"),
      to: t("10:00"),
      readings: [{ at: t("03:00"), spo2: 85, fio2: 0.5 }],
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
      readings: [{ at: t("09:30"), spo2: 94, fio2: 0.3 }],
      bands,
    });
    expect(after.unknown).toBe(1);
    const empty = timeInBand({ from: t("08:00"), to: t("08:00"), readings: [], bands });
    expect(empty).toMatchObject({ below: 0, inBand: 0, above: 0, unknown: 0 });
  });

  it("takes readings in any order", () => {
    const bands = [{ from: t("00:00"), to: null, lower: 92, upper: 96 }];
    const readings = [
      { at: t("09:00"), spo2: 90, fio2: 0.3 },
      { at: t("08:00"), spo2: 94, fio2: 0.3 },
    ];
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
      { at: t("06:00"), spo2: 90, fio2: 0.4 },
      { at: t("10:00"), spo2: 98, fio2: 0.4 },
      { at: t("12:30"), spo2: 87, fio2: 0.3 },
    ];
    const viaDates = timeInBand({ readings, bands, from: t("08:00"), to: t("17:00") });
    const viaSeries = timeInBandOfSeries({
      series: readings.map((r) => ({ t: r.at.getTime(), spo2: r.spo2, fio2: r.fio2 })),
      bands,
      from: t("08:00").getTime(),
      to: t("17:00").getTime(),
    });
    expect(viaSeries).toEqual(viaDates);
  });
});

describe("classifySpo2", () => {
  const band = { lower: 88, upper: 92 };
  it("treats above the band on room air as in band, and on oxygen as above", () => {
    expect(classifySpo2(97, 0.21, band)).toBe("inBand");
    expect(classifySpo2(97, 0.22, band)).toBe("above");
  });
  it("treats the bounds themselves as in band", () => {
    expect(classifySpo2(88, 0.4, band)).toBe("inBand");
    expect(classifySpo2(92, 0.4, band)).toBe("inBand");
    expect(classifySpo2(87.9, 0.4, band)).toBe("below");
  });
});

import { describe, expect, it } from "vitest";
import {
  DEFAULT_DETECTION,
  classifyReading,
  detectExcursions,
  exhaustedLimits,
  gradeOf,
  reassessmentOverdueMinutes,
  type DetectReading,
} from "@/lib/alerts/detect";

// Invented series. The rules under test are the issue's own (sustained 60 s,
// urgent < 85 % or ≥ 5 points under the band) and DESIGN.md's excursion rule.
const band = { lower: 92, upper: 96 };
const T0 = Date.UTC(2026, 11, 1, 8, 0, 0);

function monitor(values: number[], fio2 = 0.4, stepMs = 1000, start = T0): DetectReading[] {
  return values.map((spo2, i) => ({
    t: start + i * stepMs,
    spo2,
    fio2,
    flow: null,
    source: "monitor",
  }));
}

describe("classifyReading", () => {
  it("is below under the lower bound whatever the oxygen", () => {
    expect(classifyReading({ spo2: 91, fio2: 0.21, flow: null }, band)).toBe("below");
  });
  it("is above over the upper bound only on supplemental oxygen", () => {
    expect(classifyReading({ spo2: 98, fio2: 0.21, flow: null }, band)).toBeNull();
    expect(classifyReading({ spo2: 98, fio2: 0.3, flow: null }, band)).toBe("above");
    // Low-flow oxygen: an estimated FiO2 of 0.21 with any flow is still oxygen.
    expect(classifyReading({ spo2: 98, fio2: 0.21, flow: 1 }, band)).toBe("above");
  });
  it("treats the bounds themselves as in band", () => {
    expect(classifyReading({ spo2: 92, fio2: 0.5, flow: null }, band)).toBeNull();
    expect(classifyReading({ spo2: 96, fio2: 0.5, flow: null }, band)).toBeNull();
  });
});

describe("gradeOf", () => {
  it("is urgent under 85 % or 5 points or more under the band", () => {
    expect(gradeOf(84, "below", band, DEFAULT_DETECTION)).toBe("urgent");
    expect(gradeOf(87, "below", band, DEFAULT_DETECTION)).toBe("urgent");
    expect(gradeOf(88, "below", band, DEFAULT_DETECTION)).toBe("routine");
    expect(gradeOf(86, "below", { lower: 88, upper: 92 }, DEFAULT_DETECTION)).toBe("routine");
    expect(gradeOf(99, "above", band, DEFAULT_DETECTION)).toBe("routine");
  });
});

describe("detectExcursions: monitor series", () => {
  it("pages nobody for a short dip (artefact)", () => {
    const values = [95, ...Array<number>(30).fill(80), ...Array<number>(100).fill(95)];
    expect(detectExcursions(monitor(values), band).excursions).toEqual([]);
  });

  it("opens once the dip has lasted 60 s and grades it", () => {
    const values = [95, ...Array<number>(61).fill(90), ...Array<number>(10).fill(90)];
    const { excursions, state } = detectExcursions(monitor(values), band);
    expect(excursions).toHaveLength(1);
    const e = excursions[0]!;
    expect(e.direction).toBe("below");
    expect(e.startedAt).toBe(T0 + 1000);
    expect(e.openedAt).toBe(T0 + 61_000);
    expect(e.grade).toBe("routine");
    expect(e.resolvedAt).toBeNull();
    expect(state.phase).toBe("open");
  });

  it("restarts the 60 s when a reading returns to band in between", () => {
    const values = [...Array<number>(50).fill(90), 93, ...Array<number>(50).fill(90)];
    expect(detectExcursions(monitor(values), band).excursions).toEqual([]);
  });

  it("upgrades an open excursion to urgent when SpO2 falls further", () => {
    const values = [...Array<number>(70).fill(90), 84, 90];
    const { excursions } = detectExcursions(monitor(values), band);
    expect(excursions[0]!.grade).toBe("urgent");
    expect(excursions[0]!.upgradedAt).toBe(T0 + 70_000);
    expect(excursions[0]!.worst).toBe(84);
  });

  it("resolves only after 5 minutes back in band", () => {
    const out = [...Array<number>(70).fill(90)];
    const brief = [...Array<number>(120).fill(94), 90];
    const back = Array<number>(301).fill(94);
    const { excursions } = detectExcursions(monitor([...out, ...brief, ...back]), band);
    expect(excursions).toHaveLength(1);
    const resolvedAfter = T0 + (out.length + brief.length) * 1000 + 300_000;
    expect(excursions[0]!.resolvedAt).toBe(resolvedAfter);
  });

  it("above the band counts only while on oxygen", () => {
    expect(detectExcursions(monitor(Array<number>(120).fill(99), 0.21), band).excursions).toEqual(
      [],
    );
    const onO2 = detectExcursions(monitor(Array<number>(120).fill(99), 0.35), band).excursions;
    expect(onO2.map((e) => e.direction)).toEqual(["above"]);
  });

  it("honours a configured sustain time", () => {
    const values = Array<number>(31).fill(90);
    const opts = { ...DEFAULT_DETECTION, sustainMs: 30_000 };
    expect(detectExcursions(monitor(values), band, opts).excursions).toHaveLength(1);
    expect(detectExcursions(monitor(values), band).excursions).toHaveLength(0);
  });
});

describe("detectExcursions: manual readings", () => {
  const manual = (t: number, spo2: number): DetectReading => ({
    t,
    spo2,
    fio2: 0.4,
    flow: null,
    source: "manual",
  });

  it("opens on one charted value and resolves on the next in band", () => {
    const { excursions } = detectExcursions([manual(T0, 89), manual(T0 + 3600_000, 94)], band);
    expect(excursions).toHaveLength(1);
    expect(excursions[0]!.openedAt).toBe(T0);
    expect(excursions[0]!.resolvedAt).toBe(T0 + 3600_000);
  });

  it("ignores a backdated value older than the last one applied", () => {
    const { excursions } = detectExcursions([manual(T0, 94), manual(T0 - 60_000, 80)], band);
    expect(excursions).toEqual([]);
  });

  it("switching sides closes one excursion and opens the other", () => {
    const { excursions } = detectExcursions([manual(T0, 89), manual(T0 + 60_000, 99)], band);
    expect(excursions.map((e) => [e.direction, e.resolvedAt])).toEqual([
      ["below", T0 + 60_000],
      ["above", null],
    ]);
  });
});

describe("exhaustedLimits", () => {
  const limits = { fio2Max: 0.6, peepMax: 10, flowMax: null };
  it("names each limit at its maximum", () => {
    expect(
      exhaustedLimits({ fio2: 0.6, fio2Estimated: false, peep: 8, flow: null }, limits),
    ).toEqual(["fio2"]);
    expect(
      exhaustedLimits({ fio2: 0.5, fio2Estimated: false, peep: 10, flow: null }, limits),
    ).toEqual(["peep"]);
    expect(
      exhaustedLimits({ fio2: 0.5, fio2Estimated: false, peep: 8, flow: null }, limits),
    ).toEqual([]);
  });
  it("judges a low-flow device by its flow, not its estimated FiO2", () => {
    const lowFlow = { fio2Max: 0.4, peepMax: null, flowMax: 6 };
    expect(
      exhaustedLimits({ fio2: 0.44, fio2Estimated: true, peep: null, flow: 4 }, lowFlow),
    ).toEqual([]);
    expect(
      exhaustedLimits({ fio2: 0.44, fio2Estimated: true, peep: null, flow: 6 }, lowFlow),
    ).toEqual(["flow"]);
  });
});

describe("reassessmentOverdueMinutes", () => {
  it("is null within the interval and counts minutes past it", () => {
    expect(reassessmentOverdueMinutes(T0, 60, T0 + 60 * 60_000)).toBeNull();
    expect(reassessmentOverdueMinutes(T0, 60, T0 + 75 * 60_000)).toBe(15);
  });
});

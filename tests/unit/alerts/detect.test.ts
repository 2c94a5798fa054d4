import { describe, expect, it } from "vitest";
import {
  DEFAULT_DETECTION,
  advanceWatch,
  checkSignal,
  classifyReading,
  gradeOf,
  idleWatch,
  restartWatch,
  type DetectReading,
  type WatchEvent,
} from "@/lib/alerts/detect";
import { exhaustedLimits, reassessmentOverdueMinutes } from "@/lib/alerts/due";
import { detectExcursions } from "@/lib/alerts/replay";

// Invented series. The thresholds under test are the product's own settings
// (60 s window with 80 % out of band, urgent below 85 % or 5 points under the
// band after 15 s, 5 min back in band, signal lost after 120 s) — common
// practice for "call now" saturations, not published cut-offs — and
// the excursion rule (DEVELOPERS.md, "The product's words").
const band = { lower: 92, upper: 96 };
const T0 = Date.UTC(2026, 11, 1, 8, 0, 0);
const S = 1000;

function monitor(values: number[], fio2 = 0.4, stepMs = S, start = T0): DetectReading[] {
  return values.map((spo2, i) => ({
    t: start + i * stepMs,
    spo2,
    fio2,
    flow: null,
    source: "monitor",
  }));
}
const manual = (t: number, spo2: number, fio2 = 0.4): DetectReading => ({
  t,
  spo2,
  fio2,
  flow: null,
  source: "manual",
});
const repeat = (value: number, n: number) => Array<number>(n).fill(value);
/** A minute of 1 Hz samples in band, so the window has history before a dip. */
const inBand = repeat(95, 60);

describe("classifyReading and gradeOf", () => {
  it("is below under the lower bound whatever the oxygen, and counts every value down to 0 %", () => {
    expect(classifyReading({ spo2: 91, fio2: 0.21, flow: null }, band)).toBe("below");
    expect(classifyReading({ spo2: 0, fio2: 0.21, flow: null }, band)).toBe("below");
  });
  it("is above over the upper bound only on supplemental oxygen (FiO2 > 0.21 or any flow)", () => {
    expect(classifyReading({ spo2: 98, fio2: 0.21, flow: null }, band)).toBeNull();
    expect(classifyReading({ spo2: 98, fio2: 0.3, flow: null }, band)).toBe("above");
    // Low-flow oxygen: an estimated FiO2 of 0.21 with any flow is still oxygen.
    expect(classifyReading({ spo2: 98, fio2: 0.21, flow: 1 }, band)).toBe("above");
  });
  it("treats the bounds themselves as in band", () => {
    expect(classifyReading({ spo2: 92, fio2: 0.5, flow: null }, band)).toBeNull();
    expect(classifyReading({ spo2: 96, fio2: 0.5, flow: null }, band)).toBeNull();
  });
  it("is urgent 5 points or more under the band", () => {
    expect(gradeOf(87, "below", band, DEFAULT_DETECTION)).toBe("urgent"); // 92 − 87 = 5
    expect(gradeOf(88, "below", band, DEFAULT_DETECTION)).toBe("routine"); // 4 under, ≥ 85
  });
  it("is urgent below 85 % even when that is less than 5 points under the band (band 88–92)", () => {
    const low = { lower: 88, upper: 92 };
    // 88 − 84 = 4 points: only the absolute rule makes 84 % urgent.
    expect(gradeOf(84, "below", low, DEFAULT_DETECTION)).toBe("urgent");
    expect(gradeOf(85, "below", low, DEFAULT_DETECTION)).toBe("routine");
    expect(gradeOf(86, "below", low, DEFAULT_DETECTION)).toBe("routine");
    expect(gradeOf(99, "above", band, DEFAULT_DETECTION)).toBe("routine");
  });
});

describe("monitor series: the sliding window", () => {
  it("opens a routine excursion once 80 % of the last 60 s is out of band", () => {
    // A minute in band, then 90 %: 2 points under the band and above 85 %, so
    // routine depth and no fast path.
    const { excursions, state } = detectExcursions(monitor([...inBand, ...repeat(90, 70)]), band);
    expect(excursions).toHaveLength(1);
    const e = excursions[0]!;
    expect(e).toMatchObject({ direction: "below", grade: "routine", startedAt: T0 + 60 * S });
    // Each sample holds until the next: at t = 108 s the window (48 s, 108 s]
    // holds 48 s below of 60 monitored → 80 %; at 107 s it held 47 s.
    expect(e.openedAt).toBe(T0 + 108 * S);
    expect(state.phase).toBe("open");
  });

  it("judges a series that starts out of band once half a window is monitored", () => {
    // No history: at t = 30 s, 29 s of the 30 monitored are below (97 %).
    const { excursions } = detectExcursions(monitor([95, ...repeat(90, 70)]), band);
    expect(excursions[0]!.openedAt).toBe(T0 + 30 * S);
    expect(detectExcursions(monitor([95, ...repeat(90, 28)]), band).excursions).toEqual([]);
  });

  it("is not dodged by an in-band blip every 45 s (routine depth opens within 90 s)", () => {
    const values: number[] = [...inBand];
    for (let i = 0; i < 600; i++) values.push(i > 0 && i % 45 === 0 ? 94 : 90);
    const { excursions } = detectExcursions(monitor(values), band);
    expect(excursions).toHaveLength(1);
    // The blip at 105 s holds one second, so 48 s below arrive at 109 s.
    expect(excursions[0]!.openedAt).toBe(T0 + 109 * S);
    expect(excursions[0]!.openedAt - excursions[0]!.startedAt).toBeLessThanOrEqual(90 * S);
    expect(excursions[0]!.resolvedAt).toBeNull();
  });

  it("opens 75 % with an in-band blip every 45 s within 90 s, as urgent", () => {
    const values: number[] = [...inBand];
    for (let i = 0; i < 600; i++) values.push(i > 0 && i % 45 === 0 ? 94 : 75);
    const { excursions } = detectExcursions(monitor(values), band);
    expect(excursions).toHaveLength(1);
    expect(excursions[0]!.openedAt - excursions[0]!.startedAt).toBeLessThanOrEqual(90 * S);
    expect(excursions[0]!.grade).toBe("urgent");
  });

  it("pages nobody for a short dip at routine depth, nor for 10 s at urgent depth", () => {
    expect(
      detectExcursions(monitor([...inBand, ...repeat(89, 30), ...repeat(95, 100)]), band)
        .excursions,
    ).toEqual([]);
    expect(
      detectExcursions(monitor([...inBand, ...repeat(70, 10), ...repeat(95, 100)]), band)
        .excursions,
    ).toEqual([]);
  });

  it("ends a pending dip once back in band for more than 12 s, so a later excursion starts on its own", () => {
    // 30 s at 89 % (pending, never confirmed), 60 s in band, then 90 s at 89 %.
    const values = [...inBand, ...repeat(89, 30), ...repeat(95, 60), ...repeat(89, 90)];
    const { excursions } = detectExcursions(monitor(values), band);
    expect(excursions).toHaveLength(1);
    expect(excursions[0]!.startedAt).toBe(T0 + 150 * S);
    // A 1 s blip does not end a pending excursion: its start stays at the first low sample.
    const blip = [...inBand, ...repeat(89, 30), 95, ...repeat(89, 30)];
    expect(detectExcursions(monitor(blip), band).excursions[0]!.startedAt).toBe(T0 + 60 * S);
  });

  it("opens an urgent excursion after 60 % for 20 s (the fast path)", () => {
    const { excursions } = detectExcursions(
      monitor([...inBand, ...repeat(60, 20), ...repeat(95, 5)]),
      band,
    );
    expect(excursions).toHaveLength(1);
    expect(excursions[0]!.grade).toBe("urgent");
    // 12 s of urgent depth make 80 % of the 15 s window.
    expect(excursions[0]!.openedAt).toBe(T0 + 72 * S);
    expect(excursions[0]!.worst).toBe(60);
  });

  it("upgrades a routine excursion once urgent depth fills the short window", () => {
    const { excursions } = detectExcursions(monitor([...repeat(90, 70), ...repeat(84, 20)]), band);
    expect(excursions).toHaveLength(1);
    expect(excursions[0]!.grade).toBe("urgent");
    // Urgent depth from t = 70 s; 12 s of it fill 80 % of the window at t = 82 s.
    expect(excursions[0]!.upgradedAt).toBe(T0 + 82 * S);
  });

  it("confirms a sparse series (one sample every 5 min) on its second low sample", () => {
    const values = [94, 94, 90, 90, 90];
    const { excursions, signalLosses } = detectExcursions(monitor(values, 0.4, 5 * 60 * S), band);
    expect(excursions).toHaveLength(1);
    expect(excursions[0]!.startedAt).toBe(T0 + 10 * 60 * S);
    expect(excursions[0]!.openedAt).toBe(T0 + 15 * 60 * S);
    // Five minutes between samples is the series' pace, not a lost signal.
    expect(signalLosses).toEqual([]);
  });

  it("resolves only after 5 minutes back in band, a low sample restarting the count", () => {
    const out = repeat(90, 70);
    const brief = [...repeat(94, 120), 90];
    const back = repeat(94, 301);
    const { excursions } = detectExcursions(monitor([...out, ...brief, ...back]), band);
    expect(excursions).toHaveLength(1);
    const backAt = T0 + (out.length + brief.length) * S;
    expect(excursions[0]!.resolvedAt).toBe(backAt + 300 * S);
    expect(excursions[0]!.resolvedBy).toBe("monitor");
  });

  it("does not count a gap in the signal as time back in band", () => {
    const readings = [
      ...monitor(repeat(90, 70)),
      ...monitor(repeat(94, 200), 0.4, S, T0 + 70 * S),
      // 90 s without a sample, then in band again.
      ...monitor(repeat(94, 299), 0.4, S, T0 + 360 * S),
    ];
    const { excursions } = detectExcursions(readings, band);
    expect(excursions[0]!.resolvedAt).toBeNull();
  });

  it("above the band counts only while on oxygen", () => {
    expect(detectExcursions(monitor(repeat(99, 120), 0.21), band).excursions).toEqual([]);
    const onO2 = detectExcursions(monitor(repeat(99, 120), 0.35), band).excursions;
    expect(onO2.map((e) => e.direction)).toEqual(["above"]);
  });

  it("honours a configured window", () => {
    const values = [...inBand, ...repeat(90, 40)];
    const opts = { ...DEFAULT_DETECTION, sustainMs: 30_000 };
    expect(detectExcursions(monitor(values), band, opts).excursions).toHaveLength(1);
    expect(detectExcursions(monitor(values), band).excursions).toHaveLength(0);
  });

  it("crossing to the other side closes the excursion once the other side is sustained", () => {
    const { excursions } = detectExcursions(monitor([...repeat(90, 70), ...repeat(99, 70)]), band);
    expect(excursions.map((e) => [e.direction, e.resolvedBy])).toEqual([
      ["below", "other-side"],
      ["above", null],
    ]);
  });
});

describe("signal loss", () => {
  it("raises signal loss when the probe goes off after one low sample, and ends the pending excursion", () => {
    const readings = monitor([...repeat(95, 30), 80]);
    const lastAt = T0 + 30 * S;
    const quiet = detectExcursions(readings, band, DEFAULT_DETECTION, { until: lastAt + 119 * S });
    expect(quiet.signalLosses).toEqual([]);
    expect(quiet.state.phase).toBe("pending");
    const lost = detectExcursions(readings, band, DEFAULT_DETECTION, { until: lastAt + 120 * S });
    expect(lost.signalLosses).toEqual([
      { at: lastAt + 120 * S, lastSampleAt: lastAt, phase: "pending", restoredAt: null },
    ]);
    expect(lost.state.phase).toBe("idle");
    expect(lost.excursions).toEqual([]);
  });

  it("raises it once per silence, and the next sample restores the signal", () => {
    const state = idleWatch();
    const events: WatchEvent[] = [];
    const emit = (e: WatchEvent) => events.push(e);
    for (const r of monitor(repeat(88, 70))) advanceWatch(state, r, band, DEFAULT_DETECTION, emit);
    const last = T0 + 69 * S;
    checkSignal(state, last + 200 * S, band, DEFAULT_DETECTION, emit);
    checkSignal(state, last + 400 * S, band, DEFAULT_DETECTION, emit);
    expect(events.filter((e) => e.type === "signal-lost")).toHaveLength(1);
    expect(state.phase).toBe("open"); // an open excursion stays open
    advanceWatch(state, monitor([88], 0.4, S, last + 500 * S)[0]!, band, DEFAULT_DETECTION, emit);
    expect(events[events.length - 1]).toEqual({
      type: "signal-restored",
      at: last + 500 * S,
      source: "monitor",
    });
  });

  it("records a silence found in an imported file as lost and restored", () => {
    const readings = [
      ...monitor(repeat(88, 70)),
      ...monitor(repeat(88, 10), 0.4, S, T0 + 69 * S + 600 * S),
    ];
    const { signalLosses } = detectExcursions(readings, band);
    expect(signalLosses).toEqual([
      {
        at: T0 + 69 * S + 120 * S,
        lastSampleAt: T0 + 69 * S,
        phase: "open",
        restoredAt: T0 + 69 * S + 600 * S,
      },
    ]);
  });

  it("waits two sample intervals for a sparse series", () => {
    const readings = monitor([94, 94, 90], 0.4, 5 * 60 * S);
    const last = T0 + 10 * 60 * S;
    expect(
      detectExcursions(readings, band, DEFAULT_DETECTION, { until: last + 9 * 60 * S })
        .signalLosses,
    ).toEqual([]);
    expect(
      detectExcursions(readings, band, DEFAULT_DETECTION, { until: last + 10 * 60 * S })
        .signalLosses,
    ).toHaveLength(1);
  });

  it("says nothing about a silent monitor when no excursion is pending or open", () => {
    const { signalLosses } = detectExcursions(monitor(repeat(94, 10)), band, DEFAULT_DETECTION, {
      until: T0 + 3600 * S,
    });
    expect(signalLosses).toEqual([]);
  });
});

describe("charted (manual) values", () => {
  it("open on one charted value and resolve on the next in band", () => {
    const { excursions } = detectExcursions([manual(T0, 89), manual(T0 + 3600_000, 94)], band);
    expect(excursions).toHaveLength(1);
    expect(excursions[0]).toMatchObject({
      openedAt: T0,
      openedBy: "manual",
      resolvedAt: T0 + 3600_000,
      resolvedBy: "manual",
    });
  });

  it("chart the deepest values: 45 % and 0 % open urgent excursions", () => {
    for (const spo2 of [45, 0]) {
      const { excursions } = detectExcursions([manual(T0, spo2)], band);
      expect(excursions).toMatchObject([{ direction: "below", grade: "urgent", worst: spo2 }]);
    }
  });

  it("a spot check in band does not close what the monitor confirmed, so nothing flaps", () => {
    const readings = [
      ...monitor(repeat(88, 70)),
      manual(T0 + 70 * S, 95),
      ...monitor(repeat(88, 120), 0.4, S, T0 + 71 * S),
    ];
    const { excursions } = detectExcursions(readings, band);
    expect(excursions).toHaveLength(1);
    expect(excursions[0]).toMatchObject({ resolvedAt: null, spotChecks: 1, openedBy: "monitor" });
  });

  it("ignore a backdated value older than the last one applied", () => {
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

describe("a clinician's close", () => {
  it("forgets the monitor's earlier time out of band: another excursion needs a fresh half window", () => {
    const state = idleWatch();
    const events: WatchEvent[] = [];
    const emit = (e: WatchEvent) => events.push(e);
    const opens = () => events.filter((e) => e.type === "open").length;
    for (const r of monitor(repeat(88, 70))) advanceWatch(state, r, band, DEFAULT_DETECTION, emit);
    expect(opens()).toBe(1);
    restartWatch(state);
    // Still 88 %: without the restart the next sample would count 60 s below.
    for (const r of monitor(repeat(88, 30), 0.4, S, T0 + 70 * S))
      advanceWatch(state, r, band, DEFAULT_DETECTION, emit);
    expect(opens()).toBe(1);
    advanceWatch(state, monitor([88], 0.4, S, T0 + 100 * S)[0]!, band, DEFAULT_DETECTION, emit);
    expect(opens()).toBe(2);
  });
});

describe("stored state", () => {
  it("continues across writes exactly as one pass would (state through JSON)", () => {
    const values: number[] = [];
    for (let i = 0; i < 400; i++) values.push(i % 45 === 0 ? 94 : i < 200 ? 89 : 94);
    const readings = monitor(values);
    const whole = detectExcursions(readings, band).excursions;
    let state = idleWatch();
    const pieces = [];
    for (let i = 0; i < readings.length; i += 37) {
      const part = detectExcursions(readings.slice(i, i + 37), band, DEFAULT_DETECTION, {
        start: state,
      });
      pieces.push(...part.excursions.map((e) => e.openedAt));
      state = JSON.parse(JSON.stringify(part.state)) as typeof state;
    }
    expect(pieces).toEqual(whole.map((e) => e.openedAt));
    expect(whole).toHaveLength(1);
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

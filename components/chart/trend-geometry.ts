import { niceAxis } from "@/components/oxygenation/format";
import { pressureIn, type PressureUnit } from "@/lib/oxygen/units";
import type { Trend, TrendBand, TrendSettingsStep } from "@/lib/chart/trend";

// Geometry and scales of the trend drawing: pure functions of a loaded trend,
// no React. The panels in this folder draw with what these return.

export const W = 960;
export const M = { left: 58, right: 62 };
export const PW = W - M.left - M.right;
export const SPO2 = { top: 14, height: 170 };
export const SETTINGS = { top: 222, height: 84 };
export const GASES = { top: 344, height: 84 };
export const AXIS_Y = GASES.top + GASES.height;
export const H = AXIS_Y + 26;
export const HOUR = 3600_000;
export const TICK_STEPS_H = [1, 2, 3, 6, 12, 24, 48, 96, 168];

export type Moment = number;

export function latestAtOrBefore<T extends { at: string }>(
  items: readonly T[],
  t: number,
): T | undefined {
  let found: T | undefined;
  for (const item of items) {
    if (Date.parse(item.at) <= t) found = item;
    else break;
  }
  return found;
}

export function bandAt(bands: readonly TrendBand[], t: number): TrendBand | undefined {
  return bands.find((b) => Date.parse(b.from) <= t && t < Date.parse(b.to));
}

/** Which second setting the step panel draws beside FiO2: PEEP on ventilation, flow on HFNC and low-flow devices. */
export function secondSetting(settings: readonly TrendSettingsStep[]): "peep" | "flow" | null {
  if (settings.some((s) => s.peepCmH2O !== null)) return "peep";
  if (settings.some((s) => s.flowLMin !== null)) return "flow";
  return null;
}

export function stepPath(
  steps: readonly TrendSettingsStep[],
  value: (s: TrendSettingsStep) => number | null,
  x: (t: number) => number,
  y: (v: number) => number,
  end: number,
): string {
  let d = "";
  let penDown = false;
  steps.forEach((s, i) => {
    const v = value(s);
    const next = steps[i + 1];
    if (v === null) {
      penDown = false;
      return;
    }
    const x0 = x(Date.parse(s.at)).toFixed(1);
    const x1 = x(next ? Date.parse(next.at) : end).toFixed(1);
    const yv = y(v).toFixed(1);
    d += `${penDown ? "L" : "M"}${x0},${yv} L${x1},${yv} `;
    penDown = true;
  });
  return d.trim();
}

/** Every charted moment (SpO2 readings, settings steps, gases), oldest first, without repeats. */
export function trendMoments(trend: Trend): Moment[] {
  const all = new Set<number>();
  for (const p of trend.spo2) all.add(Date.parse(p.at));
  for (const s of trend.settings) all.add(Date.parse(s.at));
  for (const g of trend.gases) all.add(Date.parse(g.at));
  return [...all].sort((a, b) => a - b);
}

/** The charted moment nearest to time t, or null when nothing is charted. */
export function nearestMoment(moments: readonly Moment[], t: number): Moment | null {
  let best: number | null = null;
  for (const m of moments) if (best === null || Math.abs(m - t) < Math.abs(best - t)) best = m;
  return best;
}

/** The time and value scales, ticks and SpO2 path of one loaded trend. */
export function trendScales(trend: Trend, pressureUnit: PressureUnit) {
  const from = Date.parse(trend.from);
  const to = Date.parse(trend.to);
  const span = Math.max(60_000, to - from);
  const x = (t: number) => M.left + ((Math.min(Math.max(t, from), to) - from) / span) * PW;

  const lowest = Math.min(
    88,
    ...trend.spo2.map((p) => p.spo2Pct),
    ...trend.bands.map((b) => b.lowerPct),
  );
  const spo2Min = Math.max(50, Math.floor((lowest - 2) / 5) * 5);
  const ySpo2 = (v: number) => SPO2.top + ((100 - v) / (100 - spo2Min)) * SPO2.height;
  const spo2Ticks = Array.from(
    { length: Math.floor((100 - spo2Min) / 5) + 1 },
    (_, i) => 100 - i * 5,
  ).filter((v, i, all) => all.length <= 7 || i % 2 === 0);

  const second = secondSetting(trend.settings);
  const secondMax =
    second === "peep"
      ? niceAxis(Math.max(15, ...trend.settings.map((s) => s.peepCmH2O ?? 0))).max
      : niceAxis(Math.max(10, ...trend.settings.map((s) => s.flowLMin ?? 0))).max;
  const yFio2 = (v: number) => SETTINGS.top + ((1 - v) / (1 - 0.2)) * SETTINGS.height;
  const ySecond = (v: number) => SETTINGS.top + (1 - v / secondMax) * SETTINGS.height;

  const pao2Axis = niceAxis(
    Math.max(
      pressureIn(120, pressureUnit),
      ...trend.gases.map((g) => pressureIn(g.pao2MmHg, pressureUnit)),
    ),
  );
  // P/F carries PaO2's unit, so its axis follows the user's pressure unit too.
  const pfAxis = niceAxis(
    Math.max(
      pressureIn(400, pressureUnit),
      ...trend.gases.map((g) => pressureIn(g.pfRatio ?? 0, pressureUnit)),
    ),
  );
  const yPao2 = (mmHg: number) =>
    GASES.top + (1 - pressureIn(mmHg, pressureUnit) / pao2Axis.max) * GASES.height;
  const yPf = (mmHg: number) =>
    GASES.top + (1 - pressureIn(mmHg, pressureUnit) / pfAxis.max) * GASES.height;

  const stepHours = TICK_STEPS_H.find((h) => span / (h * HOUR) <= 8) ?? 168;
  const firstTick = Math.ceil(from / (stepHours * HOUR)) * stepHours * HOUR;
  const timeTicks: number[] = [];
  for (let t = firstTick; t <= to; t += stepHours * HOUR) timeTicks.push(t);

  const spo2Path = trend.spo2
    .map(
      (p, i) =>
        `${i === 0 ? "M" : "L"}${x(Date.parse(p.at)).toFixed(1)},${ySpo2(p.spo2Pct).toFixed(1)}`,
    )
    .join(" ");

  return {
    from,
    to,
    span,
    x,
    spo2Min,
    ySpo2,
    spo2Ticks,
    second,
    secondMax,
    yFio2,
    ySecond,
    pao2Axis,
    pfAxis,
    yPao2,
    yPf,
    timeTicks,
    spo2Path,
  };
}

/** The scales as the panels receive them. */
export type TrendScales = ReturnType<typeof trendScales>;

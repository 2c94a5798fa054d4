import { estimateFio2, DEVICE_PROFILES, type Device } from "../devices";
import { walkHeldSeries, type BandPeriod, type SeriesReading } from "../time-in-band";

/**
 * Per-minute sums of what the SpO2 series and the applied FiO2 did. Pure: the
 * store (./store.ts) feeds it rows and writes what it returns, the tests feed
 * it invented series. Minutes are UTC minutes (ms since the epoch, multiples
 * of 60 000), so they nest in UTC half hours and in every unit's local half
 * hours.
 */

export const MINUTE_MS = 60_000;
export const HOUR_MS = 3_600_000;
/** The coarser stored grain: half-hour slots (rollup_slots), UTC-aligned. */
export const SLOT_MS = 30 * MINUTE_MS;
/** Room air's FiO2: oxygen exposure counts what is given above it. */
export const ROOM_AIR_FIO2 = 0.21;
/** "High FiO2" for exposure counts (FiO2 ≥ 0.6, the level above which oxygen toxicity is usually discussed; common practice). */
export const HIGH_FIO2 = 0.6;

export type RollupMeasures = {
  belowMs: number;
  inBandMs: number;
  aboveMs: number;
  below88Ms: number;
  below85Ms: number;
  /** ∫ (lower bound − SpO2) dt while below the band, in %·s. */
  belowAreaPctS: number;
  /** Lowest SpO2 held during the bucket; null when nothing was known. */
  minSpo2: number | null;
  /** Time on an applied FiO2 above room air while an order was in effect and the SpO2 series known. */
  o2Ms: number;
  /** ∫ (FiO2 − 0.21) dt, in FiO2·s. */
  fio2ExcessS: number;
  /** Time at an applied FiO2 ≥ 0.6. */
  fio2HighMs: number;
};

export const emptyMeasures = (): RollupMeasures => ({
  belowMs: 0,
  inBandMs: 0,
  aboveMs: 0,
  below88Ms: 0,
  below85Ms: 0,
  belowAreaPctS: 0,
  minSpo2: null,
  o2Ms: 0,
  fio2ExcessS: 0,
  fio2HighMs: 0,
});

/** Adds `b` into `a` (sums; the minimum of the minima). */
export function addMeasures(a: RollupMeasures, b: RollupMeasures): RollupMeasures {
  a.belowMs += b.belowMs;
  a.inBandMs += b.inBandMs;
  a.aboveMs += b.aboveMs;
  a.below88Ms += b.below88Ms;
  a.below85Ms += b.below85Ms;
  a.belowAreaPctS += b.belowAreaPctS;
  if (b.minSpo2 !== null && (a.minSpo2 === null || b.minSpo2 < a.minSpo2)) a.minSpo2 = b.minSpo2;
  a.o2Ms += b.o2Ms;
  a.fio2ExcessS += b.fio2ExcessS;
  a.fio2HighMs += b.fio2HighMs;
  return a;
}

/** A stretch of time at one applied FiO2 ([from, to) in ms). */
export type Fio2Period = { from: number; to: number; fio2: number };

/** An order as the FiO2 timeline needs it: when it was in effect and what it started at. */
export type OrderSettingsInput = {
  from: number;
  to: number;
  device: Device;
  initialFio2: number;
  initialFlow: number | null;
};
/** An applied change of settings (adjustments.applied_at, to_fio2). */
export type AppliedChange = { at: number; fio2: number };

/**
 * The FiO2 applied over time: each order starts at its starting settings
 * (a low-flow device's FiO2 estimated from its flow, as the order writes it
 * to the bedside) and each adjustment applied while it is in effect sets the
 * next value. Outside every order nothing is counted.
 */
export function fio2Timeline(
  orders: readonly OrderSettingsInput[],
  changes: readonly AppliedChange[],
): Fio2Period[] {
  const sortedChanges = [...changes].sort((a, b) => a.at - b.at);
  const out: Fio2Period[] = [];
  for (const o of [...orders].sort((a, b) => a.from - b.from)) {
    const estimated = DEVICE_PROFILES[o.device].uses.fio2 === "estimated";
    let fio2 = estimated ? (estimateFio2(o.device, o.initialFlow) ?? o.initialFio2) : o.initialFio2;
    let cursor = o.from;
    for (const c of sortedChanges) {
      if (c.at < o.from) continue;
      if (c.at >= o.to) break;
      if (c.at > cursor) out.push({ from: cursor, to: c.at, fio2 });
      cursor = Math.max(cursor, c.at);
      fio2 = c.fio2;
    }
    if (o.to > cursor) out.push({ from: cursor, to: o.to, fio2 });
  }
  return out;
}

/**
 * The per-minute measures over [from, to) (both whole minutes). Only minutes
 * with something in them are returned.
 */
export function minuteMeasures(input: {
  series: readonly SeriesReading[];
  bands: readonly BandPeriod[];
  fio2: readonly Fio2Period[];
  from: number;
  to: number;
}): Map<number, RollupMeasures> {
  const out = new Map<number, RollupMeasures>();
  const bucket = (minute: number) => {
    let m = out.get(minute);
    if (!m) out.set(minute, (m = emptyMeasures()));
    return m;
  };
  // Calls `add` for each minute-sized piece of [from, to).
  const split = (from: number, to: number, add: (m: RollupMeasures, ms: number) => void) => {
    let s = from;
    while (s < to) {
      const minute = s - (s % MINUTE_MS);
      const e = Math.min(to, minute + MINUTE_MS);
      add(bucket(minute), e - s);
      s = e;
    }
  };
  const held: { from: number; to: number }[] = [];
  walkHeldSeries(input, (p) => {
    held.push({ from: p.from, to: p.to });
    split(p.from, p.to, (m, ms) => {
      if (p.cls === "below") {
        m.belowMs += ms;
        m.belowAreaPctS += ((p.lower - p.spo2) * ms) / 1000;
      } else if (p.cls === "above") m.aboveMs += ms;
      else m.inBandMs += ms;
      if (p.spo2 < 88) m.below88Ms += ms;
      if (p.spo2 < 85) m.below85Ms += ms;
      if (m.minSpo2 === null || p.spo2 < m.minSpo2) m.minSpo2 = p.spo2;
    });
  });
  // Oxygen given counts over the time the series is known: an order left in
  // effect with no one charting would otherwise accrue without end and
  // without a write to record it.
  const fio2 = [...input.fio2].sort((a, b) => a.from - b.from);
  let k = 0;
  for (const h of held) {
    while (k < fio2.length && fio2[k]!.to <= h.from) k++;
    for (let j = k; j < fio2.length && fio2[j]!.from < h.to; j++) {
      const f = fio2[j]!;
      if (f.fio2 <= ROOM_AIR_FIO2) continue;
      const from = Math.max(f.from, h.from);
      const to = Math.min(f.to, h.to);
      split(from, to, (m, ms) => {
        m.o2Ms += ms;
        m.fio2ExcessS += ((f.fio2 - ROOM_AIR_FIO2) * ms) / 1000;
        if (f.fio2 >= HIGH_FIO2) m.fio2HighMs += ms;
      });
    }
  }
  return out;
}

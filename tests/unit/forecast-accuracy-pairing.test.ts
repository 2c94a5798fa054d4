import { describe, expect, it } from "vitest";
import {
  DEFAULT_PAIRING_SETTINGS,
  UNCHECKED_REASONS,
  UNCHECKED_REASON_CODES,
  pairForecasts,
  type PairingResult,
  type UncheckedAdjustment,
} from "@/lib/forecast-accuracy";
import { arterial, change, events, orderChange, t, venous } from "./forecast-accuracy-fixture";

/** The one unchecked change of a result, or a failure. */
function onlyUnchecked(result: PairingResult): UncheckedAdjustment {
  expect(result.pairs).toEqual([]);
  expect(result.unchecked).toHaveLength(1);
  const [item] = result.unchecked;
  if (!item) throw new Error("no unchecked change");
  return item;
}

describe("pairing a stored forecast with its arterial gas", () => {
  it("uses the first arterial gas in the window and computes each model's error", () => {
    // Change at 0 min: FiO2 0.50 → 0.40, forecast pf 80, a/A 85, shunt 90 (shown range 80–90).
    // Gas 1 at −30 min is the baseline (before the change); gas 2 at 45 min is the first in
    // 20–240 min; gas 3 at 90 min comes after it and is not used.
    const result = pairForecasts(
      events([change(1, 0)], [arterial(3, 90, 70), arterial(1, -30, 100), arterial(2, 45, 84)]),
    );
    expect(result.unchecked).toEqual([]);
    expect(result.pairs).toHaveLength(1);
    const [pair] = result.pairs;
    expect(pair).toMatchObject({
      adjustmentId: 1,
      gasId: 2,
      device: "invasive",
      appliedAt: t(0),
      sampledAt: t(45),
      minutesAfter: 45,
      fromFio2: 0.5,
      toFio2: 0.4,
      fio2Step: -0.1, // 0.40 − 0.50
      peepChanged: false,
      measured: 84,
      range: { low: 80, high: 90 },
      inRange: true, // 80 ≤ 84 ≤ 90
    });
    // error = predicted − measured: pf 80 − 84 = −4, a/A 85 − 84 = +1, shunt 90 − 84 = +6
    expect(pair?.models).toEqual({
      pf: { predicted: 80, measured: 84, error: -4, absoluteError: 4 },
      alveolarArterialRatio: { predicted: 85, measured: 84, error: 1, absoluteError: 1 },
      shunt: { predicted: 90, measured: 84, error: 6, absoluteError: 6 },
    });
  });

  it("counts a gas on either edge of the range as in range and one just outside as not", () => {
    const low = pairForecasts(events([change(1, 0)], [arterial(1, 60, 80)]));
    const high = pairForecasts(events([change(1, 0)], [arterial(1, 60, 90)]));
    const above = pairForecasts(events([change(1, 0)], [arterial(1, 60, 90.5)]));
    expect(low.pairs[0]?.inRange).toBe(true);
    expect(high.pairs[0]?.inRange).toBe(true);
    expect(above.pairs[0]?.inRange).toBe(false);
  });

  it("pairs a change of FiO2 and PEEP together, flagged, since no model forecasts PEEP", () => {
    // FiO2 0.50 → 0.40 with PEEP 8 → 10 at 0 min, gas at 60 min.
    const input = events([change(1, 0, { toPeep: 10 })], [arterial(5, 60)]);
    const before = JSON.stringify(input);
    const [pair] = pairForecasts(input).pairs;
    expect(pair).toMatchObject({ adjustmentId: 1, gasId: 5, peepChanged: true });
    // The caller's events are left as they were (sorted copies only).
    expect(JSON.stringify(input)).toBe(before);
  });

  it("includes both ends of the 20–240 min window", () => {
    expect(DEFAULT_PAIRING_SETTINGS).toEqual({ minMinutes: 20, maxMinutes: 240 });
    expect(pairForecasts(events([change(1, 0)], [arterial(7, 20)])).pairs[0]?.gasId).toBe(7);
    expect(pairForecasts(events([change(1, 0)], [arterial(8, 240)])).pairs[0]?.gasId).toBe(8);
  });

  it("follows a window of the caller's own", () => {
    // 10–60 min: a gas at 15 min counts, one at 61 min is too late.
    const settings = { minMinutes: 10, maxMinutes: 60 };
    expect(pairForecasts(events([change(1, 0)], [arterial(7, 15)]), settings).pairs).toHaveLength(
      1,
    );
    const late = onlyUnchecked(pairForecasts(events([change(1, 0)], [arterial(8, 61)]), settings));
    expect(late.reason).toBe("gas_too_late");
    expect(late.detail).toContain("10–60 min");
  });

  it("refuses a window that ends before it starts or has no finite bounds", () => {
    const input = events([change(1, 0)]);
    expect(() => pairForecasts(input, { minMinutes: 60, maxMinutes: 20 })).toThrow(RangeError);
    expect(() => pairForecasts(input, { minMinutes: -1, maxMinutes: 20 })).toThrow(RangeError);
    expect(() => pairForecasts(input, { minMinutes: 0, maxMinutes: Infinity })).toThrow(RangeError);
  });
});

describe("every change left unchecked says why", () => {
  it("a gas before the change is never its check: no arterial gas in the window", () => {
    // Gas 1 at −30 min (before the change at 0) is the forecast's baseline, not its check.
    const item = onlyUnchecked(pairForecasts(events([change(1, 0)], [arterial(1, -30)])));
    expect(item.reason).toBe("no_arterial_gas");
    expect(item.label).toBe("No arterial gas in the window");
    expect(item.gasId).toBeNull();
    expect(item.detail).toContain("gas 1");
    expect(item.detail).toContain("before it");
  });

  it("a gas sampled at the very instant of the change is not after it", () => {
    const item = onlyUnchecked(pairForecasts(events([change(1, 0)], [arterial(1, 0)])));
    expect(item.reason).toBe("no_arterial_gas");
  });

  it("a second FiO2 change before the gas: the first is unchecked, the second is paired", () => {
    // Change 1 at 0 (0.50 → 0.40), change 2 at 30 min (0.40 → 0.35), arterial gas 5 at 60 min.
    // The gas is 60 min after change 1 but change 2 came first; it is 30 min after change 2.
    const result = pairForecasts(
      events([change(2, 30, { fromFio2: 0.4, toFio2: 0.35 }), change(1, 0)], [arterial(5, 60, 75)]),
    );
    expect(result.unchecked).toHaveLength(1);
    expect(result.unchecked[0]).toMatchObject({
      adjustmentId: 1,
      reason: "changed_again",
      label: "Changed again before a gas",
      gasId: 5,
      interruptedAt: t(30),
    });
    expect(result.unchecked[0]?.detail).toContain("adjustment 2");
    expect(result.pairs.map((p) => [p.adjustmentId, p.gasId, p.minutesAfter])).toEqual([
      [2, 5, 30],
    ]);
  });

  it("a second change before the window opens and no gas at all: changed again", () => {
    const item = pairForecasts(
      events([change(1, 0), change(2, 10, { fromFio2: 0.4, toFio2: 0.3, forecast: null })]),
    ).unchecked.find((u) => u.adjustmentId === 1);
    expect(item).toMatchObject({ reason: "changed_again", gasId: null, interruptedAt: t(10) });
  });

  it("a gas taken at the same instant as the next change no longer checks the first", () => {
    // (appliedAt, sampledAt] holds the next change at 60 min when the gas is sampled at 60 min.
    const result = pairForecasts(
      events(
        [change(1, 0), change(2, 60, { fromFio2: 0.4, toFio2: 0.3, forecast: null })],
        [arterial(5, 60)],
      ),
    );
    expect(result.unchecked.find((u) => u.adjustmentId === 1)?.reason).toBe("changed_again");
  });

  it("changes at the same instant are taken in the order they were recorded", () => {
    // Changes 5 and 6 both at 0 min, given in reverse: 6 is the later, so 5 is interrupted.
    const result = pairForecasts(
      events([change(6, 0, { fromFio2: 0.4, toFio2: 0.35 }), change(5, 0)], [arterial(9, 45)]),
    );
    expect(result.pairs.map((p) => p.adjustmentId)).toEqual([6]);
    expect(result.unchecked.map((u) => [u.adjustmentId, u.reason])).toEqual([[5, "changed_again"]]);
  });

  it("a later change of flow alone does not interrupt", () => {
    // Change 2 at 30 min keeps FiO2 0.40 and PEEP 8 (a flow change): the gas at 60 min checks change 1.
    const result = pairForecasts(
      events(
        [change(1, 0), change(2, 30, { fromFio2: 0.4, toFio2: 0.4, forecast: null })],
        [arterial(5, 60)],
      ),
    );
    expect(result.pairs.map((p) => [p.adjustmentId, p.gasId])).toEqual([[1, 5]]);
    expect(result.unchecked.map((u) => [u.adjustmentId, u.reason])).toEqual([[2, "no_forecast"]]);
  });

  it("a PEEP-only change stores no forecast, and interrupts the change before it", () => {
    // Change 2 at 30 min: FiO2 0.40 kept, PEEP 8 → 10, no forecast. Gas at 60 min.
    const result = pairForecasts(
      events(
        [
          change(1, 0),
          change(2, 30, { fromFio2: 0.4, toFio2: 0.4, fromPeep: 8, toPeep: 10, forecast: null }),
        ],
        [arterial(5, 60)],
      ),
    );
    expect(result.pairs).toEqual([]);
    const byId = new Map(result.unchecked.map((u) => [u.adjustmentId, u]));
    expect(byId.get(1)).toMatchObject({ reason: "changed_again", interruptedAt: t(30) });
    expect(byId.get(2)).toMatchObject({
      reason: "no_forecast",
      label: "No forecast stored",
      fio2Step: 0,
      gasId: null,
    });
    expect(byId.get(2)?.detail).toContain("PEEP or flow change only");
  });

  it("an FiO2 change without a stored forecast is unchecked with the same reason", () => {
    const item = onlyUnchecked(
      pairForecasts(events([change(1, 0, { forecast: null })], [arterial(5, 60)])),
    );
    expect(item.reason).toBe("no_forecast");
    expect(item.detail).toContain("No forecast was stored");
  });

  it("a venous gas is never used, and the reason says so when it was the only one", () => {
    const item = onlyUnchecked(pairForecasts(events([change(1, 0)], [venous(4, 45)])));
    expect(item).toMatchObject({
      reason: "venous_only",
      label: "Only a venous gas in the window",
      gasId: 4,
    });
    expect(item.detail).toContain("venous gases are never used");
    // With an arterial gas after it, the arterial one is paired and the venous one skipped.
    const both = pairForecasts(events([change(1, 0)], [venous(4, 45), arterial(5, 60)]));
    expect(both.pairs.map((p) => p.gasId)).toEqual([5]);
  });

  it("an order change before the gas leaves the change unchecked", () => {
    // Order superseded at 30 min, arterial gas at 60 min.
    const item = onlyUnchecked(
      pairForecasts(events([change(1, 0)], [arterial(5, 60)], [orderChange(30)])),
    );
    expect(item).toMatchObject({
      reason: "order_changed",
      label: "Order changed before a gas",
      gasId: 5,
      interruptedAt: t(30),
    });
  });

  it("an order change at the instant of the change, or after the window, does not interrupt", () => {
    // (appliedAt, sampledAt] is open at the change: the order that started with it is its own.
    const same = pairForecasts(events([change(1, 0)], [arterial(5, 60)], [orderChange(0)]));
    expect(same.pairs.map((p) => p.gasId)).toEqual([5]);
    // The order changes at 300 min, after the window closed at 240: the gas at 320 is too late.
    const late = onlyUnchecked(
      pairForecasts(events([change(1, 0)], [arterial(5, 320)], [orderChange(300)])),
    );
    expect(late.reason).toBe("gas_too_late");
  });

  it("an order change and another change at the same instant: the order change is named", () => {
    const result = pairForecasts(
      events(
        [change(1, 0), change(2, 30, { fromFio2: 0.4, toFio2: 0.3, forecast: null })],
        [arterial(5, 60)],
        [orderChange(30)],
      ),
    );
    expect(result.unchecked.find((u) => u.adjustmentId === 1)?.reason).toBe("order_changed");
  });

  it("a gas before the window opens is too early", () => {
    // Arterial gas at 10 min, none later: 10 < 20.
    const item = onlyUnchecked(pairForecasts(events([change(1, 0)], [arterial(5, 10)])));
    expect(item).toMatchObject({ reason: "gas_too_early", label: "Gas too early", gasId: 5 });
    expect(item.detail).toContain("10 min after this change");
    // 19 min is still too early.
    expect(onlyUnchecked(pairForecasts(events([change(1, 0)], [arterial(5, 19)]))).reason).toBe(
      "gas_too_early",
    );
  });

  it("a gas after the window closes is too late", () => {
    // Arterial gas at 241 min: 241 > 240.
    const item = onlyUnchecked(pairForecasts(events([change(1, 0)], [arterial(5, 241)])));
    expect(item).toMatchObject({ reason: "gas_too_late", label: "Gas too late", gasId: 5 });
    expect(item.detail).toContain("241 min after this change");
  });

  it("gases on both sides of the window: too early, naming the late one too", () => {
    const item = onlyUnchecked(
      pairForecasts(events([change(1, 0)], [arterial(5, 10), arterial(6, 300)])),
    );
    expect(item).toMatchObject({ reason: "gas_too_early", gasId: 5 });
    expect(item.detail).toContain("gas 6");
  });

  it("a venous gas in the window outranks an arterial one too early", () => {
    const item = onlyUnchecked(
      pairForecasts(events([change(1, 0)], [arterial(5, 10), venous(6, 45)])),
    );
    expect(item.reason).toBe("venous_only");
  });

  it("accounts for every change exactly once over a whole admission", () => {
    // 0 min  change 1 (forecast)          → gas 11 at 30 min: paired
    // 60     change 2 (forecast)          → only a venous gas 12 at 90, then change 3: changed again
    // 120    change 3 (PEEP only)         → no forecast
    // 180    change 4 (forecast)          → gas 13 at 190: too early; order change at 230: order changed
    // 400    change 5 (forecast)          → gas 14 at 700: too late
    // 800    change 6 (forecast)          → no gas after it
    const input = events(
      [
        change(1, 0),
        change(2, 60, { fromFio2: 0.4, toFio2: 0.45 }),
        change(3, 120, { fromFio2: 0.45, toFio2: 0.45, toPeep: 10, forecast: null }),
        change(4, 180, { fromFio2: 0.45, toFio2: 0.5 }),
        change(5, 400, { fromFio2: 0.5, toFio2: 0.4 }),
        change(6, 800, { fromFio2: 0.4, toFio2: 0.35 }),
      ],
      [arterial(11, 30), venous(12, 90), arterial(13, 190), arterial(14, 700)],
      [orderChange(230)],
    );
    const result = pairForecasts(input);
    expect(result.pairs.map((p) => p.adjustmentId)).toEqual([1]);
    expect(result.unchecked.map((u) => [u.adjustmentId, u.reason])).toEqual([
      [2, "changed_again"],
      [3, "no_forecast"],
      [4, "order_changed"],
      [5, "gas_too_late"],
      [6, "no_arterial_gas"],
    ]);
    // Change 2's reason also names the venous gas that was not used.
    expect(result.unchecked[0]?.detail).toContain("venous gases never are");
  });

  it("names every reason in the catalogue with distinct words", () => {
    expect(Object.keys(UNCHECKED_REASONS)).toEqual([...UNCHECKED_REASON_CODES]);
    const labels = UNCHECKED_REASON_CODES.map((c) => UNCHECKED_REASONS[c].label);
    expect(new Set(labels).size).toBe(UNCHECKED_REASON_CODES.length);
    for (const code of UNCHECKED_REASON_CODES) {
      expect(UNCHECKED_REASONS[code].definition.length).toBeGreaterThan(20);
    }
    expect(UNCHECKED_REASONS.venous_only.definition).toContain("never used");
  });
});

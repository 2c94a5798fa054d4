import { describe, expect, it } from "vitest";
import { defaultProposedFio2Percent, HYPOXAEMIA } from "@/lib/oxygenation/forecast-default";

const RANGE = { min: 21, max: 100 };

describe("the forecast's opening proposed FiO2", () => {
  it("steps up for a gas with SpO2 85 % (below the 92 % hypoxaemia line, common practice)", () => {
    expect(defaultProposedFio2Percent({ fio2: 0.4, pao2: 52, spo2: 85 }, RANGE)).toEqual({
      percent: 50,
      direction: "up",
    });
  });

  it("steps up on PaO2 below 60 mmHg even with no saturation measured", () => {
    expect(defaultProposedFio2Percent({ fio2: 0.35, pao2: 55 }, RANGE).direction).toBe("up");
  });

  it("uses co-oximetry SaO2 (a fraction) when there is no SpO2", () => {
    expect(defaultProposedFio2Percent({ fio2: 0.5, pao2: 70, sao2: 0.9 }, RANGE).direction).toBe(
      "up",
    );
    expect(defaultProposedFio2Percent({ fio2: 0.5, pao2: 70, sao2: 0.95 }, RANGE).direction).toBe(
      "down",
    );
  });

  it("steps down (weaning) when the gas is not hypoxaemic", () => {
    expect(defaultProposedFio2Percent({ fio2: 0.6, pao2: 110, spo2: 98 }, RANGE)).toEqual({
      percent: 50,
      direction: "down",
    });
  });

  it("turns at the ends of the range instead of proposing no change", () => {
    expect(defaultProposedFio2Percent({ fio2: 0.21, pao2: 95, spo2: 97 }, RANGE)).toEqual({
      percent: 31,
      direction: "up",
    });
    expect(defaultProposedFio2Percent({ fio2: 1, pao2: 50, spo2: 80 }, RANGE)).toEqual({
      percent: 90,
      direction: "down",
    });
  });

  it("treats the thresholds themselves as not hypoxaemic", () => {
    const at = { fio2: 0.4, pao2: HYPOXAEMIA.pao2Mmhg, spo2: HYPOXAEMIA.spo2Pct };
    expect(defaultProposedFio2Percent(at, RANGE).direction).toBe("down");
  });
});

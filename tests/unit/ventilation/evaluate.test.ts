import { describe, expect, it } from "vitest";
import { OxygenInputError } from "@/lib/oxygen";
import {
  breachWords,
  evaluateCheck,
  lungProtectionBreaches,
  type CheckValues,
} from "@/lib/ventilation/evaluate";
import { bodyWeightOf, tidalVolumeForTarget } from "@/lib/ventilation/settings";

// Worked by hand from the published equations; each check names its source.
const male180 = { heightCm: 180, sex: "male" as const };
const values: CheckValues = {
  measuredVtMl: 450,
  measuredRate: 20,
  totalPeep: 10,
  minuteVentilationLMin: 9,
  peakPressure: 34,
  plateauPressure: 28,
};
const gas = { paco2: 45, sampledAt: "2026-12-08T08:00:00.000Z" };
const limits = { vtMaxMlKg: 8, plateauLimit: 30, drivingLimit: 15 };

describe("what a ventilator check computes", () => {
  const i = evaluateCheck(values, male180, "volume_control", gas);

  it("predicted body weight and VT per kg: 50 + 0.91 × (180 − 152.4) = 75.116 kg; 450 / 75.116 = 5.99 mL/kg (ARDS Network, NEJM 2000;342:1301)", () => {
    expect(i.predictedBodyWeight.value).toBeCloseTo(75.116, 3);
    expect(i.vtPerKg.value).toBeCloseTo(5.9907, 3);
    expect(i.vtPerKg.basis.inputs).toEqual({
      VT: { value: 450, unit: "mL" },
      PBW: { value: 75.1, unit: "kg" },
    });
    expect(i.vtPerKg.basis.source).toContain("N Engl J Med 2000;342:1301");
  });

  it("driving pressure 28 − 10 = 18 cmH2O (Amato et al., NEJM 2015;372:747) and static compliance 450 / 18 = 25 mL/cmH2O (common practice)", () => {
    expect(i.drivingPressure!.value).toBe(18);
    expect(i.drivingPressure!.basis.source).toContain("Amato");
    expect(i.staticCompliance!.value).toBe(25);
    expect(i.staticCompliance!.basis.source).toContain("common practice");
  });

  it("mechanical power 0.098 × 20 × 0.45 × (34 − 18 / 2) = 22.05 J/min (Gattinoni et al., Intensive Care Med 2016;42:1567)", () => {
    expect(i.mechanicalPower!.value).toBeCloseTo(22.05, 6);
    expect(i.mechanicalPower!.basis.source).toContain("Gattinoni");
    expect(i.mechanicalPower!.basis.assumptions.join(" ")).toContain("as here");
  });

  it("ventilatory ratio 9000 × 45 / (75.116 × 100 × 37.5) = 1.438 (Sinha et al., Br J Anaesth 2009;102:692)", () => {
    expect(i.ventilatoryRatio!.value).toBeCloseTo(1.4378, 3);
    expect(i.ventilatoryRatio!.basis.assumptions[0]).toContain(gas.sampledAt);
  });

  it("without a measured minute ventilation, VT × rate stands in and the basis says so", () => {
    const noVe = evaluateCheck(
      { ...values, minuteVentilationLMin: undefined },
      male180,
      "volume_control",
      gas,
    );
    // 0.45 L × 20 /min = 9 L/min: the same ratio as with VE 9 measured.
    expect(noVe.ventilatoryRatio!.value).toBeCloseTo(1.4378, 3);
    expect(noVe.ventilatoryRatio!.basis.assumptions.join(" ")).toContain("VT × rate used");
  });

  it("leaves out what was not measured: no plateau, no driving pressure, compliance or power; no gas, no ratio", () => {
    const bare = evaluateCheck(
      { measuredVtMl: 400, measuredRate: 18, totalPeep: 6 },
      { heightCm: 165, sex: "female" },
      "pressure_support",
      null,
    );
    expect(Object.keys(bare).sort()).toEqual(["predictedBodyWeight", "vtPerKg"]);
    // 45.5 + 0.91 × 12.6 = 56.966 kg (ARDS Network equation).
    expect(bare.predictedBodyWeight.value).toBeCloseTo(56.966, 3);
  });

  it("says mechanical power is an approximation outside volume control (Gattinoni 2016: the simplified equation is for volume control)", () => {
    const pc = evaluateCheck(values, male180, "pressure_control", gas);
    expect(pc.mechanicalPower!.basis.assumptions.join(" ")).toContain("approximation");
  });

  it("refuses a plateau not above PEEP as the engine does, naming the field", () => {
    expect(() =>
      evaluateCheck({ ...values, plateauPressure: 10 }, male180, "volume_control", null),
    ).toThrow(OxygenInputError);
  });
});

describe("the order's lung-protective limits", () => {
  it("plateau 33 cmH2O above a limit of 30 (ARDS Network, NEJM 2000;342:1301) and driving pressure 23 above 15 (common practice)", () => {
    const v = { ...values, plateauPressure: 33, peakPressure: 38 };
    const i = evaluateCheck(v, male180, "volume_control", null);
    const breaches = lungProtectionBreaches(i, v, limits);
    expect(breaches).toEqual([
      { what: "plateau", value: 33, limit: 30, unit: "cmH2O" },
      { what: "driving_pressure", value: 23, limit: 15, unit: "cmH2O" },
    ]);
    expect(breaches.map(breachWords)).toEqual([
      "plateau pressure 33 cmH2O (limit 30)",
      "driving pressure 23 cmH2O (limit 15)",
    ]);
  });

  it("compares VT per kg as shown, to one decimal: 8.04 is 8.0 and within, 8.06 is 8.1 and above", () => {
    const pbw = 75.116;
    const at = (ml: number) =>
      lungProtectionBreaches(
        evaluateCheck({ ...values, measuredVtMl: ml }, male180, "volume_control", null),
        values,
        { ...limits, drivingLimit: 20 },
      );
    expect(at(Math.floor(8.04 * pbw))).toEqual([]);
    expect(at(Math.ceil(8.06 * pbw))).toEqual([
      { what: "vt_per_kg", value: 8.1, limit: 8, unit: "mL/kg PBW" },
    ]);
  });

  it("a plateau at its limit and a driving pressure at its limit are within", () => {
    const v = { ...values, totalPeep: 15, plateauPressure: 30, peakPressure: 35 };
    const i = evaluateCheck(v, male180, "volume_control", null);
    expect(lungProtectionBreaches(i, v, limits)).toEqual([]);
  });
});

describe("the order's tidal volume in mL", () => {
  it("6 mL/kg of 56.966 kg is 342 mL, to the whole mL", () => {
    expect(tidalVolumeForTarget(6, 56.966)).toBe(342);
  });

  it("asks for a height rather than guessing: none, or outside the equation's 130–230 cm", () => {
    expect(bodyWeightOf({ heightCm: null, sex: "female" })).toBeNull();
    expect(bodyWeightOf({ heightCm: 120, sex: "female" })).toBeNull();
    expect(bodyWeightOf({ heightCm: 165, sex: "female" })).toEqual({
      pbwKg: 57,
      heightCm: 165,
      sex: "female",
    });
  });
});

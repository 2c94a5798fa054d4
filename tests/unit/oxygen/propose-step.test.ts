import { describe, expect, it } from "vitest";
import {
  ardsNetworkTable,
  forecastFio2Change,
  OxygenInputError,
  PEEP_NOT_FORECAST,
  po2FromSaturation,
  proposeStep,
  type ProposeStepInput,
  type TitrationOrder,
} from "@/lib/oxygen";

const lowerPeepOrder: TitrationOrder = {
  spo2Target: { lower: 88, upper: 95 },
  limits: { fio2Min: 0.3, fio2Max: 1, peepMin: 5, peepMax: 24 },
  steps: ardsNetworkTable("lower-peep"),
};
const bloodGas = { pao2: 55, paco2: 45, hemoglobin: 11, fio2: 0.4, peep: 8 };

const input = (overrides: Partial<ProposeStepInput>): ProposeStepInput => ({
  order: lowerPeepOrder,
  current: { fio2: 0.4, peep: 8 },
  latestReading: { spo2: 91 },
  latestBloodGas: bloodGas,
  ...overrides,
});

describe("proposeStep", () => {
  it("holds in the target band, without step or forecast", () => {
    const proposal = proposeStep(input({}));
    expect(proposal).toMatchObject({ direction: "hold", step: null, forecast: null });
    expect(proposal.reason).toContain("within the target band 88–95 %");
  });

  it("steps up to the next table row below the band, with the forecast at that FiO2", () => {
    const proposal = proposeStep(input({ latestReading: { spo2: 85 } }));
    expect(proposal.direction).toBe("up");
    expect(proposal.step).toMatchObject({ fio2: 0.5, peep: 8, stepIndex: 3 });
    expect(proposal.forecast).toEqual(
      forecastFio2Change({ fio2: 0.4, pao2: 55, paco2: 45, hemoglobin: 11, nextFio2: 0.5 }),
    );
    expect(proposal.reason).toBe(
      "SpO2 85 % is below the target band 88–95 %: next step up is FiO2 0.5, PEEP 8 cmH2O (step 4 of 14).",
    );
  });

  it("replaces the general PEEP caveat with the specific one when the step changes PEEP", () => {
    const proposal = proposeStep(
      input({ current: { fio2: 0.5, peep: 8 }, latestReading: { spo2: 85 } }),
    );
    expect(proposal.step).toMatchObject({ fio2: 0.5, peep: 10 });
    expect(proposal.caveats).toContain(
      "PEEP changes from 8 to 10 cmH2O: its effect is not forecast — re-measure after the change.",
    );
    expect(proposal.caveats).not.toContain(PEEP_NOT_FORECAST);
  });

  it("weans to the previous row above the band on FiO2 > 0.21", () => {
    const proposal = proposeStep(
      input({ current: { fio2: 0.5, peep: 10 }, latestReading: { spo2: 98 } }),
    );
    expect(proposal.direction).toBe("down");
    expect(proposal.step).toMatchObject({ fio2: 0.5, peep: 8, stepIndex: 3 });
    expect(proposal.reason).toContain("next step down (wean)");
  });

  it("holds above the band on room air: nothing to wean", () => {
    const proposal = proposeStep(
      input({ current: { fio2: 0.21 }, latestReading: { spo2: 99 }, latestBloodGas: null }),
    );
    expect(proposal).toMatchObject({ direction: "hold", step: null });
    expect(proposal.reason).toContain("room air");
  });

  it("holds above the band at the lowest step the order allows, asking for review", () => {
    const proposal = proposeStep(
      input({ current: { fio2: 0.3, peep: 5 }, latestReading: { spo2: 99 } }),
    );
    expect(proposal).toMatchObject({ direction: "hold", step: null });
    expect(proposal.reason).toContain("review the order");
  });

  it("escalates when the next step is outside the order's limits, naming the limit", () => {
    const order = {
      ...lowerPeepOrder,
      limits: { fio2Min: 0.3, fio2Max: 0.6, peepMin: 5, peepMax: 10 },
    };
    // 86 % is 2 points under the band and above 85 %: routine depth.
    const proposal = proposeStep(
      input({ order, current: { fio2: 0.6, peep: 10 }, latestReading: { spo2: 86 } }),
    );
    expect(proposal).toMatchObject({
      direction: "escalate",
      urgent: false,
      step: null,
      forecast: null,
    });
    expect(proposal.stoppedBy).toBe("the order's FiO2 maximum 0.6");
    expect(proposal.reason).toBe(
      "SpO2 86 % is below the target band 88–95 % and the order's FiO2 maximum 0.6 stops the next table step (FiO2 0.7, PEEP 10 cmH2O): escalate to the prescriber.",
    );
  });

  it("escalates at the top of the table", () => {
    const proposal = proposeStep(
      input({ current: { fio2: 1, peep: 24 }, latestReading: { spo2: 84 } }),
    );
    expect(proposal.direction).toBe("escalate");
    expect(proposal.reason).toContain("no higher step");
  });

  it("offers both ends of a published PEEP range, lower end first (FiO2 1.0, PEEP 18–24)", () => {
    const first = proposeStep(
      input({ current: { fio2: 0.9, peep: 18 }, latestReading: { spo2: 86 } }),
    );
    expect(first.step).toMatchObject({ fio2: 1, peep: 18, stepIndex: 13 });
    const second = proposeStep(
      input({ current: { fio2: 1, peep: 18 }, latestReading: { spo2: 86 } }),
    );
    expect(second.step).toMatchObject({ fio2: 1, peep: 24, stepIndex: 13 });
  });

  it("offers both ends of a published FiO2 range (FiO2 0.5–0.8 at PEEP 20) in the higher-PEEP table", () => {
    const order = { ...lowerPeepOrder, steps: ardsNetworkTable("higher-peep") };
    const up = proposeStep(
      input({ order, current: { fio2: 0.5, peep: 18 }, latestReading: { spo2: 86 } }),
    );
    expect(up.step).toMatchObject({ fio2: 0.5, peep: 20, stepIndex: 9 });
    const down = proposeStep(
      input({ order, current: { fio2: 0.8, peep: 22 }, latestReading: { spo2: 97 } }),
    );
    expect(down.step).toMatchObject({ fio2: 0.8, peep: 20, stepIndex: 9 });
  });

  it("never lowers FiO2 or PEEP when stepping up from a setting that is not on the table", () => {
    const proposal = proposeStep(
      input({ current: { fio2: 0.45, peep: 8 }, latestReading: { spo2: 86 } }),
    );
    expect(proposal.step).toMatchObject({ fio2: 0.5, peep: 8 });
    expect(proposal.caveats.some((caveat) => caveat.includes("not a row of the step table"))).toBe(
      true,
    );
  });

  it("titrates HFNC steps by FiO2 and flow", () => {
    const order: TitrationOrder = {
      spo2Target: { lower: 92, upper: 96 },
      limits: { fio2Min: 0.3, fio2Max: 0.6, flowMin: 30, flowMax: 60 },
      steps: [
        { fio2: 0.3, flow: 30 },
        { fio2: 0.4, flow: 40 },
        { fio2: 0.5, flow: 50 },
        { fio2: 0.6, flow: 60 },
      ],
    };
    const up = proposeStep({
      order,
      current: { fio2: 0.4, flow: 40 },
      latestReading: { spo2: 90 },
    });
    expect(up.step).toMatchObject({ fio2: 0.5, flow: 50, stepIndex: 2 });
    const top = proposeStep({
      order,
      current: { fio2: 0.6, flow: 60 },
      latestReading: { spo2: 90 },
    });
    expect(top.direction).toBe("escalate");
  });

  it("imputes PaO2 from SpO2 ≤ 96 % when there is no blood gas, and says so", () => {
    const proposal = proposeStep(input({ latestReading: { spo2: 86 }, latestBloodGas: null }));
    const pao2 = po2FromSaturation(0.86);
    expect(proposal.forecast).toEqual(
      forecastFio2Change({ fio2: 0.4, pao2, paco2: 40, hemoglobin: 12, nextFio2: 0.5 }),
    );
    expect(
      proposal.caveats.some((caveat) =>
        caveat.startsWith(`No blood gas: PaO2 ${Math.round(pao2)} mmHg imputed`),
      ),
    ).toBe(true);
  });

  it("gives no forecast without a blood gas when SpO2 is above 96 %", () => {
    const proposal = proposeStep(
      input({
        current: { fio2: 0.5, peep: 8 },
        latestReading: { spo2: 98 },
        latestBloodGas: undefined,
      }),
    );
    expect(proposal.direction).toBe("down");
    expect(proposal.forecast).toBeNull();
    expect(proposal.caveats.some((caveat) => caveat.includes("too flat to impute"))).toBe(true);
  });

  it("notes a blood gas taken at another FiO2 or PEEP, and a missing haemoglobin", () => {
    const proposal = proposeStep(
      input({
        current: { fio2: 0.5, peep: 10 },
        latestReading: { spo2: 85 },
        latestBloodGas: { pao2: 55, paco2: 45, fio2: 0.4, peep: 8 },
      }),
    );
    expect(proposal.caveats).toEqual(
      expect.arrayContaining([
        "The blood gas has no haemoglobin: 12 g/dL assumed for the shunt model.",
        "The blood gas was taken at FiO2 0.4, not the current 0.5: the forecast starts from the blood gas.",
        "The blood gas was taken at PEEP 8 cmH2O, not the current 10 cmH2O.",
      ]),
    );
  });

  describe("urgent depth (below 85 %, or 5 points or more under the band: common practice)", () => {
    it("is urgent at SpO2 84 % with band 88–95 (under 85 %, only 4 points under the band)", () => {
      expect(proposeStep(input({ latestReading: { spo2: 84 } })).urgent).toBe(true);
      expect(proposeStep(input({ latestReading: { spo2: 86 } })).urgent).toBe(false);
    });

    it("is urgent 5 points under a low band even above 85 % (band 92–96, SpO2 87 %)", () => {
      const order = { ...lowerPeepOrder, spo2Target: { lower: 92, upper: 96 } };
      expect(proposeStep(input({ order, latestReading: { spo2: 87 } })).urgent).toBe(true);
      expect(proposeStep(input({ order, latestReading: { spo2: 88 } })).urgent).toBe(false);
    });

    it("SpO2 70 % on FiO2 0.4: call the prescriber now, and go as far as the order allows when nothing is forecast to reach the band", () => {
      // PaO2 37 mmHg is about 70 % on the standard curve: a gas that agrees with the SpO2,
      // and a shunt so large that even FiO2 1.0 leaves the pessimistic forecast under 88 %.
      const gas = { ...bloodGas, pao2: 37 };
      const proposal = proposeStep(input({ latestReading: { spo2: 70 }, latestBloodGas: gas }));
      expect(proposal).toMatchObject({ direction: "up", urgent: true, stoppedBy: null });
      expect(proposal.reason).toMatch(
        /^SpO2 70 % is below 85 %, below the target band 88–95 % \(urgent\): call the prescriber now\./,
      );
      expect(proposal.step).toMatchObject({ fio2: 1, peep: 24, stepIndex: 13 });
      expect(proposal.stepsMoved).toBe(12);
      expect(proposal.forecast!.range.low.spo2).toBeLessThan(88);
      expect(proposal.caveats.join(" ")).not.toContain("worsened since the gas");
    });

    it("goes to the least support forecast to reach the band", () => {
      // PaO2 45 mmHg ≈ 81 %, SpO2 80 % (urgent, under 85 %): the pessimistic forecast
      // reaches 88 % first at FiO2 1.0.
      const gas = { ...bloodGas, pao2: 45 };
      const proposal = proposeStep(input({ latestReading: { spo2: 80 }, latestBloodGas: gas }));
      const low = (fio2: number) =>
        forecastFio2Change({ fio2: 0.4, pao2: 45, paco2: 45, hemoglobin: 11, nextFio2: fio2 }).range
          .low.spo2;
      expect(proposal.step).toMatchObject({ fio2: 1, peep: 18, stepIndex: 13 });
      expect(low(1)).toBeGreaterThanOrEqual(88);
      expect(low(0.9)).toBeLessThan(88);
      expect(proposal.reason).toContain(
        "FiO2 1, PEEP 18 cmH2O (step 14 of 14, 11 table settings up)",
      );
    });

    it("goes at least two settings up, and warns when the blood gas predates the fall", () => {
      // PaO2 55 mmHg means about 88 %: the gas was taken before SpO2 fell to 70 %.
      const proposal = proposeStep(input({ latestReading: { spo2: 70 } }));
      expect(proposal).toMatchObject({ direction: "up", urgent: true, stepsMoved: 2 });
      expect(proposal.step).toMatchObject({ fio2: 0.5, peep: 10 });
      expect(proposal.caveats).toContain(
        "The blood gas's PaO2 55 mmHg means a saturation of about 88 %, but SpO2 is now 70 %: the patient has worsened since the gas, so the forecast is likely optimistic.",
      );
    });

    it("stops at the order's limit and names it", () => {
      const order = {
        ...lowerPeepOrder,
        limits: { fio2Min: 0.3, fio2Max: 0.5, peepMin: 5, peepMax: 10 },
      };
      const proposal = proposeStep(input({ order, latestReading: { spo2: 60 } }));
      expect(proposal).toMatchObject({
        direction: "up",
        urgent: true,
        stoppedBy: "the order's FiO2 maximum 0.5",
      });
      expect(proposal.step).toMatchObject({ fio2: 0.5, peep: 10 });
      expect(proposal.stepsMoved).toBe(2);
      expect(proposal.reason).toContain(
        "the order's FiO2 maximum 0.5 stops the next table step (FiO2 0.6, PEEP 10 cmH2O)",
      );
    });

    it("charts SpO2 0 % without imputing PaO2 from it: two settings up, no forecast", () => {
      const proposal = proposeStep(input({ latestReading: { spo2: 0 }, latestBloodGas: null }));
      expect(proposal).toMatchObject({
        direction: "up",
        urgent: true,
        stepsMoved: 2,
        forecast: null,
      });
      expect(proposal.step).toMatchObject({ fio2: 0.5, peep: 10 });
    });

    it("at the top of the table says so and still calls now", () => {
      const proposal = proposeStep(
        input({ current: { fio2: 1, peep: 24 }, latestReading: { spo2: 70 } }),
      );
      expect(proposal).toMatchObject({ direction: "escalate", urgent: true, step: null });
      expect(proposal.reason).toContain("call the prescriber now");
      expect(proposal.reason).toContain("no higher step");
    });
  });

  it("weans when a blood gas's PaO2 is above the order's PaO2 band, with SpO2 in band", () => {
    const order = { ...lowerPeepOrder, pao2Target: { lower: 55, upper: 80 } };
    const gas = { pao2: 150, paco2: 40, hemoglobin: 11, fio2: 0.5, peep: 10 };
    const proposal = proposeStep(
      input({
        order,
        current: { fio2: 0.5, peep: 10 },
        latestReading: { spo2: 94 },
        latestBloodGas: gas,
      }),
    );
    expect(proposal.direction).toBe("down");
    expect(proposal.step).toMatchObject({ fio2: 0.5, peep: 8 });
    expect(proposal.reason).toContain(
      "PaO2 150 mmHg is above the PaO2 band 55–80 mmHg (SpO2 94 % in band)",
    );
    // Without a PaO2 band the same gas holds.
    expect(
      proposeStep(
        input({
          current: { fio2: 0.5, peep: 10 },
          latestReading: { spo2: 94 },
          latestBloodGas: gas,
        }),
      ).direction,
    ).toBe("hold");
  });

  it.each([
    [
      "order.spo2Target.upper",
      input({ order: { ...lowerPeepOrder, spo2Target: { lower: 92, upper: 90 } } }),
    ],
    [
      "order.limits.fio2Max",
      input({ order: { ...lowerPeepOrder, limits: { fio2Min: 0.5, fio2Max: 0.4 } } }),
    ],
    [
      "order.steps[1].peep",
      input({
        order: {
          ...lowerPeepOrder,
          steps: [
            { fio2: 0.3, peep: 5 },
            { fio2: 0.4, peep: [10, 8] },
          ],
        },
      }),
    ],
    ["current.fio2", input({ current: { fio2: 40 } })],
    ["latestReading.spo2", input({ latestReading: { spo2: 101 } })],
    ["latestReading.spo2", input({ latestReading: { spo2: -1 } })],
    ["latestBloodGas.pao2", input({ latestBloodGas: { ...bloodGas, pao2: 7.3 } })],
  ])("refuses a bad %s with its path", (field, bad) => {
    expect(() => proposeStep(bad)).toThrowError(OxygenInputError);
    try {
      proposeStep(bad);
    } catch (error) {
      expect(error instanceof OxygenInputError && error.field).toBe(field);
    }
  });
});

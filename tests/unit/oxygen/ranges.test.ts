import { describe, expect, it } from "vitest";
import { bloodGasSchema } from "@/lib/blood-gases/schema";
import { DEVICE_DEFAULTS, DEVICE_PROFILES, DEVICES } from "@/lib/devices";
import { checkBloodGasCandidate, checkReadingCandidate } from "@/lib/imports/rows";
import { orderFieldsSchema } from "@/lib/orders/schema";
import { ardsNetworkTable, type InputRange, proposeStep, RANGES, rangeRefusal } from "@/lib/oxygen";
import { assessRequestSchema } from "@/lib/oxygenation/schema";
import { readingSchema } from "@/lib/readings/schema";

const inside = (value: number, range: Pick<InputRange, "min" | "max">) =>
  value >= range.min && value <= range.max;
const ends = (v: number | readonly [number, number]) => (typeof v === "number" ? [v, v] : v);

describe("the range table (lib/oxygen/ranges.ts)", () => {
  it.each(Object.entries(RANGES))(
    "%s has a label, ordered bounds, a unit and a reason",
    (_, range) => {
      expect(range.label.length).toBeGreaterThan(0);
      expect(range.min).toBeLessThan(range.max);
      expect(typeof range.unit).toBe("string");
      expect(range.why.length).toBeGreaterThan(20);
    },
  );

  it("states a range in the schemas' words: FiO2 to two decimals, no unit for fractions or pH", () => {
    expect(rangeRefusal("FiO2", RANGES.fio2)).toBe("FiO2 must be between 0.21 and 1.00.");
    expect(rangeRefusal("PaO2", RANGES.pao2)).toBe("PaO2 must be between 10 and 700 mmHg.");
    expect(rangeRefusal("pH", RANGES.ph)).toBe("pH must be between 6.5 and 8.");
  });

  it("accepts SpO2 0–100 % wherever a reading enters: the form and API, the monitor import, the engine", () => {
    for (const spo2 of [0, 45, 100]) {
      expect(readingSchema.shape.spo2.safeParse(spo2).success).toBe(true);
      const row = checkReadingCandidate(
        {
          line: 2,
          label: "line 2",
          mrn: "M1",
          takenAt: "2026-11-20 08:15",
          spo2: { text: String(spo2), unit: "%" },
          pulseRate: undefined,
        },
        "UTC",
      );
      expect(row.ok).toBe(true);
      expect(assessRequestSchema.safeParse({ fio2: 0.4, pao2: 80, paco2: 40, spo2 }).success).toBe(
        true,
      );
      expect(() =>
        proposeStep({
          order: {
            spo2Target: { lower: 92, upper: 96 },
            limits: { fio2Min: 0.21, fio2Max: 0.6 },
            steps: [],
          },
          current: { fio2: 0.4 },
          latestReading: { spo2 },
        }),
      ).not.toThrow();
    }
    expect(readingSchema.shape.spo2.safeParse(101).error?.issues[0]?.message).toBe(
      "SpO2 must be between 0 and 100 %.",
    );
  });

  it("refuses the same flow in the orders and the engine: 0.5–70 L/min", () => {
    const order = (flowMin: number) => orderFieldsSchema.shape.flowMin.safeParse(flowMin).success;
    expect([order(0.4), order(0.5), order(70), order(71)]).toEqual([false, true, true, false]);
    const engine = (flow: number) => () =>
      proposeStep({
        order: {
          spo2Target: { lower: 92, upper: 96 },
          limits: { fio2Min: 0.21, fio2Max: 0.6 },
          steps: [],
        },
        current: { fio2: 0.4, flow },
        latestReading: { spo2: 94 },
      });
    expect(engine(0.4)).toThrow(/current.flow must be between 0.5 and 70/);
    expect(engine(70)).not.toThrow();
  });

  it("keeps an arterial saturation floor and a lower venous one, in the form schema and the import", () => {
    const gas = {
      patientId: 1,
      sampledAt: "2026-11-20T08:15:00Z",
      pao2: 60,
      paco2: 40,
      device: "room_air",
      sao2: 30,
    };
    const refused = bloodGasSchema.safeParse({ ...gas, sampleType: "arterial" });
    expect(refused.error?.issues.map((i) => i.message)).toEqual([
      "SaO2 must be between 40 and 100 %.",
    ]);
    expect(bloodGasSchema.safeParse({ ...gas, sampleType: "venous" }).success).toBe(true);
    const imported = checkBloodGasCandidate(
      {
        line: 2,
        label: "line 2",
        mrn: "M1",
        sampledAt: "2026-11-20 08:15",
        sampleType: "arterial",
        values: {
          pao2: { text: "60", unit: "mmHg" },
          paco2: { text: "40", unit: "mmHg" },
          sao2: { text: "30", unit: "%" },
        },
      },
      "UTC",
    );
    expect(imported.ok ? [] : imported.rejected.reasons.map((r) => r.message)).toEqual([
      "SaO2 must be between 40 and 100 % (30 % given).",
    ]);
  });
});

describe("device ranges (lib/devices) inside the table's", () => {
  it.each(DEVICES)("%s", (device) => {
    const profile = DEVICE_PROFILES[device];
    expect(inside(profile.fio2.min, RANGES.fio2) && inside(profile.fio2.max, RANGES.fio2)).toBe(
      true,
    );
    if (profile.flow)
      expect(inside(profile.flow.min, RANGES.flow) && inside(profile.flow.max, RANGES.flow)).toBe(
        true,
      );
    if (profile.peep)
      expect(inside(profile.peep.min, RANGES.peep) && inside(profile.peep.max, RANGES.peep)).toBe(
        true,
      );
    const defaults = DEVICE_DEFAULTS[device];
    expect(defaults.fio2.every((v) => inside(v, profile.fio2))).toBe(true);
    if (defaults.flow)
      expect(profile.flow && defaults.flow.every((v) => inside(v, profile.flow!))).toBe(true);
    if (defaults.peep)
      expect(profile.peep && defaults.peep.every((v) => inside(v, profile.peep!))).toBe(true);
  });

  it("the ARDS Network tables' steps lie inside the FiO2 and PEEP ranges", () => {
    for (const name of ["lower-peep", "higher-peep"] as const) {
      for (const step of ardsNetworkTable(name)) {
        expect(ends(step.fio2).every((v) => inside(v, RANGES.fio2))).toBe(true);
        expect(ends(step.peep).every((v) => inside(v, RANGES.peep))).toBe(true);
      }
    }
  });
});

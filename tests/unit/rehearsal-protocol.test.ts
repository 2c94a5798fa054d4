import { describe, expect, it } from "vitest";
import { DEFAULT_DETECTION } from "@/lib/alerts/detect";
import { ardsNetworkTable } from "@/lib/oxygen";
import { DEFAULT_PARAMETERS, defaultOrder, rehearsalBasis } from "@/lib/rehearsal";
import { rehearsalFormDefaults } from "@/lib/rehearsal/form-defaults";
import { protocolOrders, protocolProblems, rehearsalParameters } from "@/lib/rehearsal/protocol";
import { rehearsalCreateSchema, type RehearsalSettings } from "@/lib/rehearsal/schema";
import { orderStepsOf } from "@/lib/step-tables/steps";

const settings = (over: Partial<RehearsalSettings> = {}): RehearsalSettings => ({
  ...rehearsalCreateSchema.parse({
    ...rehearsalFormDefaults({
      unitId: 1,
      ventilatedTableId: 1,
      detection: DEFAULT_DETECTION,
      escalateAfterMinutes: 10,
    }),
    label: "Test",
  }),
  seed: 1,
  ...over,
});

describe("a rehearsal's protocol", () => {
  it("reads a stored table's rows as the engine's steps: ranges stay ranges, single values numbers", () => {
    expect(
      orderStepsOf([
        { fio2Min: 0.3, fio2Max: 0.3, peepMin: 5, peepMax: 5, flow: null },
        { fio2Min: 1, fio2Max: 1, peepMin: 18, peepMax: 24, flow: null },
        { fio2Min: 0.4, fio2Max: 0.5, peepMin: null, peepMax: null, flow: 40 },
      ]),
    ).toEqual([
      { fio2: 0.3, peep: 5 },
      { fio2: 1, peep: [18, 24] },
      { fio2: [0.4, 0.5], flow: 40 },
    ]);
  });

  it("with the form's defaults reproduces the default cohort's orders and parameters", () => {
    const s = settings();
    const orders = protocolOrders(s, { ventilated: ardsNetworkTable("lower-peep"), hfnc: null });
    expect(orders.ventilator).toEqual(defaultOrder("ventilator"));
    expect(orders.hfnc).toEqual(defaultOrder("hfnc"));
    const p = rehearsalParameters(s, orders);
    expect({ ...p, protocol: undefined }).toEqual({ ...DEFAULT_PARAMETERS, protocol: undefined });
    // Nothing differs from the defaults, so no basis line says "set for this run".
    expect(rehearsalBasis(p).filter((b) => b.source.startsWith("set for this run"))).toEqual([]);
  });

  it("takes the band, limits and a high-flow table's own flows as its flow limits", () => {
    const s = settings({ spo2Lower: 88, spo2Upper: 92, hfncFio2Max: 0.6 });
    const hfnc = [
      { fio2: 0.3, flow: 30 },
      { fio2: 0.4, flow: 50 },
    ];
    const orders = protocolOrders(s, { ventilated: ardsNetworkTable("higher-peep"), hfnc });
    expect(orders.hfnc.limits).toEqual({ fio2Min: 0.21, fio2Max: 0.6, flowMin: 30, flowMax: 50 });
    expect(orders.ventilator.spo2Target).toEqual({ lower: 88, upper: 92 });
    expect(orders.hfnc.spo2Target).toEqual({ lower: 88, upper: 92 });
  });

  it("names the table whose steps all lie outside the limits", () => {
    const s = settings({ ventilatedFio2Min: 0.21, ventilatedFio2Max: 0.25, hfncFio2Min: 0.9 });
    const orders = protocolOrders(s, {
      ventilated: ardsNetworkTable("lower-peep"),
      hfnc: [{ fio2: 0.5, flow: 40 }],
    });
    expect(protocolProblems(orders)).toEqual([
      {
        field: "ventilatedTableId",
        message:
          "No step of the ventilated patients' table lies within FiO2 0.21–0.25 and PEEP 5–18 cmH2O.",
      },
      {
        field: "hfncTableId",
        message: "No step of the high-flow patients' table lies within FiO2 0.9–0.8.",
      },
    ]);
  });

  it("carries the alert and response figures into the care parameters, and the basis says they were set", () => {
    const s = settings({ sustainSeconds: 90, urgentBelowPct: 80, nurseResponseMinutes: 2 });
    const orders = protocolOrders(s, { ventilated: ardsNetworkTable("lower-peep"), hfnc: null });
    const p = rehearsalParameters(s, orders);
    expect(p.care.detection).toMatchObject({ sustainMs: 90_000, urgentBelowPct: 80 });
    expect(p.care.nurseResponse.medianMinutes).toBe(2);
    const nurse = rehearsalBasis(p).find((b) => b.name === "Nurse response to an alert")!;
    const detection = rehearsalBasis(p).find((b) => b.name === "Alert detection")!;
    expect(detection.value).toBe("sustain 90 s at 80 % out of band; urgent below 80 % for 15 s");
    expect(detection.source).toMatch(/^set for this run; the default sustain 60 s/);
    expect(nurse.source).toBe(
      "set for this run; the default median 4 min, log-normal σ 0.7: assumed — common practice",
    );
  });
});

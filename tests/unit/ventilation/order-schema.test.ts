import { describe, expect, it } from "vitest";
import { orderInputSchema } from "@/lib/orders/schema";

// The ventilator part of the one order schema the composer and the server share.

const base = {
  entryMode: "written",
  password: "x",
  patientId: 1,
  device: "invasive",
  spo2Lower: 88,
  spo2Upper: 95,
  fio2Min: 0.3,
  fio2Max: 0.8,
  peepMin: 5,
  peepMax: 14,
  initialFio2: 0.4,
  initialPeep: 8,
  ventMode: "volume_control",
  vtTarget: 6,
  vtMin: 4,
  vtMax: 8,
  rateMin: 12,
  rateMax: 30,
  reassessMinutes: 60,
  rationale: "ARDS, lung-protective ventilation",
  supersedesOrderId: null,
};

function refusals(over: Record<string, unknown>): Record<string, string[]> {
  const parsed = orderInputSchema.safeParse({ ...base, ...over });
  if (parsed.success) return {};
  const out: Record<string, string[]> = {};
  for (const issue of parsed.error.issues) (out[issue.path.join(".")] ??= []).push(issue.message);
  return out;
}

describe("a ventilator order's fields", () => {
  it("accepts the usual lung-protective order, the pressure limits left to their defaults", () => {
    expect(refusals({})).toEqual({});
  });

  it("names the field and its range when a value is outside it", () => {
    expect(refusals({ plateauLimit: 45 })).toEqual({
      plateauLimit: ["Plateau pressure limit must be between 20 and 40 cmH2O."],
    });
    expect(refusals({ drivingLimit: 5 })).toEqual({
      drivingLimit: ["Driving pressure limit must be between 8 and 25 cmH2O."],
    });
    expect(refusals({ rateMax: 50 })).toEqual({
      rateMax: ["Rate maximum must be between 4 and 40 /min."],
    });
  });

  it("requires the mode, the tidal volume and the rate range on a ventilator device", () => {
    const r = refusals({ ventMode: undefined, vtTarget: undefined, rateMin: undefined });
    expect(Object.keys(r).sort()).toEqual(["rateMin", "ventMode", "vtTarget"]);
  });

  it("keeps the target inside its range and the minimums below the maximums", () => {
    expect(refusals({ vtTarget: 9 })).toEqual({
      vtTarget: ["Tidal volume target must lie within its range (4–8 mL/kg PBW)."],
    });
    expect(refusals({ rateMin: 32 })).toEqual({
      rateMax: ["Rate maximum must not be below the minimum."],
    });
  });

  it("offers NIV pressure support or CPAP only", () => {
    expect(
      refusals({
        device: "niv",
        peepMin: 5,
        peepMax: 10,
        initialPeep: 5,
        ventMode: "volume_control",
      }),
    ).toEqual({
      ventMode: ["NIV / CPAP offers Pressure support (PS) or CPAP, not Volume control (VC)."],
    });
  });

  it("refuses ventilator settings on a device without a ventilator", () => {
    const r = refusals({
      device: "venturi_mask",
      fio2Min: 0.24,
      fio2Max: 0.6,
      initialFio2: 0.35,
      peepMin: undefined,
      peepMax: undefined,
      initialPeep: undefined,
    });
    expect(r.ventMode?.[0]).toContain("Venturi mask has no ventilator settings");
  });
});

import { describe, expect, it } from "vitest";
import { ardsNetworkTable, forecastFio2Change } from "@/lib/oxygen";
import {
  CARE_MODELS,
  CHUNK_MS,
  DEFAULT_PARAMETERS,
  defaultOrder,
  drawPatient,
  Random,
  rehearsalBasis,
  runRehearsal,
  runStay,
  steadyPao2,
  steadySaturation,
  VirtualPatient,
  type RehearsalParameters,
} from "@/lib/rehearsal";
import { timeInBandOfSeries, walkHeldSeries, type SeriesReading } from "@/lib/time-in-band";

/** The defaults with the patient's course held still: no walk, no events, no recovery. */
const still: RehearsalParameters = {
  ...DEFAULT_PARAMETERS,
  patient: {
    ...DEFAULT_PARAMETERS.patient,
    driftPerRootHour: 0,
    recoveryPerDay: 0,
    desaturationPerHour: 0,
    suctionPerHour: 0,
    repositionShiftSd: 0,
  },
};

describe("seeded random numbers", () => {
  it("repeat for a seed and differ between seeds", () => {
    const a = new Random(42);
    const b = new Random(42);
    const c = new Random(43);
    const xs = Array.from({ length: 5 }, () => a.next());
    expect(Array.from({ length: 5 }, () => b.next())).toEqual(xs);
    expect(Array.from({ length: 5 }, () => c.next())).not.toEqual(xs);
    for (const x of xs) expect(x >= 0 && x < 1).toBe(true);
  });
});

describe("virtual patient", () => {
  it("at steady state has the saturation the engine's shunt forecast gives for the same inputs", () => {
    const profile = drawPatient(3, 0, still);
    const shunt = profile.startShunt;
    const patient = new VirtualPatient(profile, 3, still);
    for (let s = 0; s < 3000; s++) patient.advance(0.5);
    // The shunt model of the bedside forecast (Berggren 1942 shunt equation,
    // Severinghaus 1979 curve; lib/oxygen/sources.ts), from a gas the patient
    // would give at its starting FiO2, forecast to FiO2 0.5.
    const forecast = forecastFio2Change({
      fio2: profile.startSetting.fio2,
      pao2: steadyPao2(profile, shunt, profile.startSetting.fio2),
      paco2: profile.paco2,
      hemoglobin: profile.hemoglobin,
      barometricPressure: profile.barometricPressure,
      nextFio2: 0.5,
    });
    expect(forecast.shuntFraction).toBeCloseTo(shunt, 9);
    expect(patient.shunt).toBe(shunt);
    expect(patient.sao2).toBeCloseTo(forecast.models.shunt.spo2, 6);
    expect(steadySaturation(profile, shunt, 0.5)).toBeCloseTo(forecast.models.shunt.spo2, 9);
  });

  it("saturates more on more oxygen and less with more shunt", () => {
    // The shunt equation's direction (Berggren 1942; common practice).
    const profile = drawPatient(3, 0, DEFAULT_PARAMETERS);
    expect(steadySaturation(profile, 0.2, 0.4)).toBeGreaterThan(
      steadySaturation(profile, 0.2, 0.3),
    );
    expect(steadySaturation(profile, 0.3, 0.4)).toBeLessThan(steadySaturation(profile, 0.2, 0.4));
  });

  it("starts within the order's limits, at least a point into the band when the order allows", () => {
    for (let i = 0; i < 20; i++) {
      const profile = drawPatient(11, i, DEFAULT_PARAMETERS);
      const { limits, spo2Target } = profile.order;
      expect(profile.startSetting.fio2).toBeGreaterThanOrEqual(limits.fio2Min);
      expect(profile.startSetting.fio2).toBeLessThanOrEqual(limits.fio2Max);
      const start = steadySaturation(profile, profile.startShunt, profile.startSetting.fio2);
      if (profile.startSetting.fio2 < limits.fio2Max)
        expect(start).toBeGreaterThanOrEqual(spo2Target.lower + 1);
    }
  });

  it("meets the same course under every care model: the shunt does not depend on the care", () => {
    const profile = drawPatient(5, 1, DEFAULT_PARAMETERS);
    const low = new VirtualPatient(profile, 5, DEFAULT_PARAMETERS);
    const high = new VirtualPatient(profile, 5, DEFAULT_PARAMETERS);
    for (let s = 0; s < 7200; s++) {
      low.advance(0.3);
      high.advance(0.6);
      expect(high.shunt).toBe(low.shunt);
      expect(high.spo2 === null).toBe(low.spo2 === null);
    }
    expect(high.sao2).toBeGreaterThan(low.sao2);
  });

  it("keeps the oximeter's assumed accuracy inside ISO 80601-2-61's Arms ≤ 4 % (recalled from memory)", () => {
    const { biasSd, precisionSd } = DEFAULT_PARAMETERS.oximeter;
    expect(Math.hypot(biasSd, precisionSd)).toBeLessThanOrEqual(4);
  });
});

describe("rehearsal measures", () => {
  it("equal time in band and its held pieces over the same 1 Hz series, across chunk boundaries and probe-off gaps", () => {
    const params: RehearsalParameters = {
      ...DEFAULT_PARAMETERS,
      oximeter: { ...DEFAULT_PARAMETERS.oximeter, probeOffPerHour: 3, probeOffMedianMinutes: 4 },
    };
    const profile = drawPatient(9, 2, params);
    const series: SeriesReading[] = [];
    const flow = profile.startSetting.flow ?? null;
    const stay = runStay(profile, "tidemark", 9, 3.5, params, (t, spo2, fio2) => {
      if (spo2 !== null) series.push({ t, spo2, fio2, flow, source: "monitor" });
    });
    const to = 3.5 * 3_600_000;
    expect(to).toBeGreaterThan(3 * CHUNK_MS);
    const bands = [{ from: new Date(0), to: null, ...profile.order.spo2Target }];
    const whole = timeInBandOfSeries({ series, bands, from: 0, to });
    expect(whole.ms.unknown).toBeGreaterThan(0); // the gaps are there
    expect(stay.inBandMs).toBe(whole.ms.inBand);
    expect(stay.belowMs).toBe(whole.ms.below);
    expect(stay.aboveMs).toBe(whole.ms.above);
    expect(stay.unknownMs).toBe(whole.ms.unknown);
    let below88 = 0;
    walkHeldSeries({ series, bands, from: 0, to }, (p) => {
      if (p.spo2 < 88) below88 += p.to - p.from;
    });
    expect(stay.below88Ms).toBe(below88);
  });
});

describe("care models", () => {
  it("keep every applied FiO2 within the order's limits, and only the Tidemark workflow raises alerts", () => {
    for (let i = 0; i < 4; i++) {
      const profile = drawPatient(13, i, DEFAULT_PARAMETERS);
      const { fio2Min, fio2Max } = profile.order.limits;
      for (const model of CARE_MODELS) {
        const seen = new Set<number>();
        const stay = runStay(profile, model, 13, 12, DEFAULT_PARAMETERS, (_t, _spo2, fio2) => {
          seen.add(fio2);
        });
        for (const fio2 of seen) {
          expect(fio2).toBeGreaterThanOrEqual(fio2Min);
          expect(fio2).toBeLessThanOrEqual(fio2Max);
        }
        expect(seen.size - 1).toBeLessThanOrEqual(stay.adjustments);
        if (model === "tidemark") expect(stay.alerts).toBeGreaterThan(0);
        else expect(stay.alerts).toBe(0);
      }
    }
  });
});

describe("rehearsal runs", () => {
  it("repeat exactly for a seed", () => {
    const input = { seed: 7, patients: 3, hours: 4 };
    const first = runRehearsal(input);
    expect(runRehearsal(input)).toEqual(first);
    expect(runRehearsal({ ...input, seed: 8 }).stays).not.toEqual(first.stays);
  });

  it("list every default with a source for the basis view", () => {
    const basis = rehearsalBasis();
    expect(basis.length).toBeGreaterThan(10);
    for (const entry of basis) {
      expect(entry.value).not.toBe("");
      expect(entry.source).not.toBe("");
    }
  });
});

describe("a protocol under rehearsal", () => {
  const higherPeep: RehearsalParameters = {
    ...DEFAULT_PARAMETERS,
    protocol: {
      ventilator: {
        ...defaultOrder("ventilator"),
        // The ARDS Network higher-PEEP table (source: lib/oxygen ardsNetworkTableSource), in place of the lower-PEEP one.
        steps: ardsNetworkTable("higher-peep"),
      },
    },
  };

  it("changes the orders, not the patients: the same seed meets the same cohort", () => {
    let ventilated = 0;
    for (let i = 0; i < 20; i++) {
      const a = drawPatient(7, i, DEFAULT_PARAMETERS);
      const b = drawPatient(7, i, higherPeep);
      expect(b.hemoglobin).toBe(a.hemoglobin);
      expect(b.startShunt).toBe(a.startShunt);
      expect(b.device).toBe(a.device);
      if (a.device === "ventilator") {
        ventilated++;
        expect(b.order.steps).toEqual(ardsNetworkTable("higher-peep"));
        expect(a.order.steps).toEqual(ardsNetworkTable("lower-peep"));
      } else expect(b.order).toEqual(a.order);
    }
    expect(ventilated).toBeGreaterThan(0);
  });

  it("repeats exactly, differs from the default where the orders differ, and names itself in the basis", () => {
    const input = { seed: 11, patients: 6, hours: 4, models: ["fixed-interval" as const] };
    const once = runRehearsal({ ...input, parameters: higherPeep });
    const twice = runRehearsal({ ...input, parameters: higherPeep });
    expect(twice.models).toEqual(once.models);
    const base = runRehearsal(input);
    const ventilatedIndex = once.stays.findIndex(
      (_, i) => drawPatient(11, i, DEFAULT_PARAMETERS).device === "ventilator",
    );
    expect(ventilatedIndex).toBeGreaterThanOrEqual(0);
    // A ventilated stay titrates along another table, so the FiO2 it is given differs.
    expect(once.stays[ventilatedIndex]!.fio2HoursAboveRoomAir).not.toBe(
      base.stays[ventilatedIndex]!.fio2HoursAboveRoomAir,
    );
    const basis = rehearsalBasis(higherPeep).find((b) => b.name === "Order, ventilated")!;
    expect(basis.source).toBe("the protocol under rehearsal");
  });
});

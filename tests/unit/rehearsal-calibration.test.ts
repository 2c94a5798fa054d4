import { describe, expect, it } from "vitest";
import { DEFAULT_COHORT, PUBLISHED_MANUAL_MEDIAN_IN_RANGE, runRehearsal } from "@/lib/rehearsal";

describe("rehearsal calibration", () => {
  it("puts the fixed-interval routine within ±10 points of the published manual-titration median time in range (BMJ Open Respir Res 2021;8:e000843)", () => {
    // A third of the default cohort over its full stay length, to stay quick.
    const run = runRehearsal({
      seed: 2021,
      patients: 30,
      hours: DEFAULT_COHORT.hours,
      models: ["fixed-interval"],
    });
    const fixed = run.models[0]!;
    expect(Math.abs(fixed.medianInBand - PUBLISHED_MANUAL_MEDIAN_IN_RANGE)).toBeLessThanOrEqual(
      0.1,
    );
  });

  it("has the instant reference beat the fixed-interval routine on time in band", () => {
    const run = runRehearsal({
      seed: 31,
      patients: 8,
      hours: 24,
      models: ["fixed-interval", "reference"],
    });
    const [fixed, reference] = run.models;
    expect(reference!.inBand).toBeGreaterThan(fixed!.inBand);
    expect(reference!.medianInBand).toBeGreaterThan(fixed!.medianInBand);
  });
});

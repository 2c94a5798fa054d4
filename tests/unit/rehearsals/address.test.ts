import { describe, expect, it } from "vitest";
import { parseRehearsalSearch, rehearsalHref, toggleRun } from "@/lib/rehearsal/address";

describe("the Rehearsal page's address", () => {
  it("reads the unit (unit, or unitId) and up to two runs, dropping what is not a positive whole number", () => {
    expect(parseRehearsalSearch({ unit: "2", run: "12", compare: "14" })).toEqual({
      unitId: 2,
      runs: [12, 14],
    });
    expect(parseRehearsalSearch({ unitId: "3" })).toEqual({ unitId: 3, runs: [] });
    expect(parseRehearsalSearch({ unit: "x", run: "-1", compare: "1e3" })).toEqual({
      unitId: null,
      runs: [],
    });
    expect(parseRehearsalSearch({ run: "12", compare: "12" }).runs).toEqual([12]);
    expect(parseRehearsalSearch({ compare: "14" }).runs).toEqual([14]);
  });

  it("writes the unit and the runs back in the order they were chosen", () => {
    expect(rehearsalHref(1, [])).toBe("/rehearsals?unit=1");
    expect(rehearsalHref(1, [12])).toBe("/rehearsals?unit=1&run=12");
    expect(rehearsalHref(1, [12, 14])).toBe("/rehearsals?unit=1&run=12&compare=14");
  });

  it("ticks a run on until two are chosen and off again", () => {
    expect(toggleRun([], 12)).toEqual([12]);
    expect(toggleRun([12], 14)).toEqual([12, 14]);
    expect(toggleRun([12, 14], 15)).toEqual([12, 14]);
    expect(toggleRun([12, 14], 12)).toEqual([14]);
  });
});

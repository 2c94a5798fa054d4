import { describe, expect, it } from "vitest";
import { z } from "zod";
import { emptyToUndefined, isEmptyInput, optionalNumber, toNumber } from "@/lib/number-input";

describe("empty number inputs", () => {
  it.each([
    ["", true],
    ["   ", true],
    [null, true],
    [undefined, true],
    [Number.NaN, true],
    [0, false],
    ["0", false],
    ["abc", false],
  ])("%j is empty: %s", (value, empty) => {
    expect(isEmptyInput(value)).toBe(empty);
  });

  it("schemas read an empty field as not given and leave the rest to the schema", () => {
    expect(emptyToUndefined("")).toBeUndefined();
    expect(emptyToUndefined(Number.NaN)).toBeUndefined();
    expect(emptyToUndefined("abc")).toBe("abc");
    const peep = optionalNumber(z.number().min(0).max(30));
    expect(peep.parse("")).toBeUndefined();
    expect(peep.parse(null)).toBeUndefined();
    expect(peep.parse(8)).toBe(8);
    expect(peep.safeParse(31).success).toBe(false);
    expect(peep.safeParse("8").success).toBe(false);
  });

  it("text inputs: a decimal comma is accepted, text that is not a number stays NaN", () => {
    expect(toNumber(" 0,4 ")).toBe(0.4);
    expect(toNumber("12")).toBe(12);
    expect(toNumber("")).toBeUndefined();
    expect(toNumber(7)).toBe(7);
    expect(toNumber("high")).toBeNaN();
  });
});

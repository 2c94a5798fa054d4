import { describe, expect, it } from "vitest";
import { allUnknown, shareText } from "@/lib/time-in-band/share-text";

describe("shareText", () => {
  it("rounds to whole percent away from the ends", () => {
    expect(shareText(0.5)).toBe("50 %");
    expect(shareText(0.994)).toBe("99 %");
    expect(shareText(0.006)).toBe("1 %");
  });

  it("never shows 100 % for a share short of all, nor 0 % for a share above none", () => {
    // 30 s out of band in 24 h: 0.03 % of the day.
    const inBand = 1 - 30 / 86_400;
    expect(shareText(inBand)).toBe(">99 %");
    expect(shareText(1 - inBand)).toBe("<1 %");
    expect(shareText(1)).toBe("100 %");
    expect(shareText(0)).toBe("0 %");
  });
});

describe("allUnknown", () => {
  it("is true only when nothing in the window was measured", () => {
    expect(allUnknown({ unknown: 1 })).toBe(true);
    expect(allUnknown({ unknown: 0.98 })).toBe(false);
  });
});

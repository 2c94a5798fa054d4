import { describe, expect, it } from "vitest";
import { readTrendOperation } from "@/lib/chart/operations";

describe("the trend's query schema", () => {
  const to = "2026-12-01T08:00:00Z";

  it("refuses a malformed time naming the field, without reaching the range check", () => {
    // A malformed time is a continuable issue in zod: the range check still ran, on the raw string.
    const parsed = readTrendOperation.schema.safeParse({ patientId: "1", from: "yesterday", to });
    expect(parsed.success).toBe(false);
    expect(parsed.error?.issues.map((i) => i.path.join("."))).toEqual(["from"]);
  });

  it("refuses a range that ends before it starts or spans more than 31 days", () => {
    const backwards = readTrendOperation.schema.safeParse({
      patientId: "1",
      from: "2026-12-02T08:00:00Z",
      to,
    });
    expect(backwards.error?.issues[0]?.message).toBe("To must be after from.");
    const long = readTrendOperation.schema.safeParse({
      patientId: "1",
      from: "2026-10-01T08:00:00Z",
      to,
    });
    expect(long.error?.issues[0]?.message).toBe("The range may span at most 31 days.");
  });
});

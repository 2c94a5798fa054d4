import { describe, expect, it } from "vitest";
import { ValidationError } from "@/lib/errors";
import { lateHandover, outgoingWindow, resolveHandover } from "@/lib/handoff/handover";
import { handoffAcknowledgeSchema, handoffQuerySchema } from "@/lib/handoff/schema";

const utc12 = { timeZone: "UTC", shiftStart: "07:00", shiftHours: 12 } as const;
const iso = (d: Date) => d.toISOString();

describe("which handover a handoff is about", () => {
  const now = new Date("2026-12-03T15:00:00Z");

  it('"next" is the current shift handing over to the next one', () => {
    const h = resolveHandover(utc12, "next", now);
    expect(iso(h.outgoing.startsAt)).toBe("2026-12-03T07:00:00.000Z");
    expect(iso(h.incoming.startsAt)).toBe("2026-12-03T19:00:00.000Z");
  });

  it("accepts the next shift's start by its instant", () => {
    const h = resolveHandover(utc12, new Date("2026-12-03T19:00:00Z"), now);
    expect(iso(h.incoming.startsAt)).toBe("2026-12-03T19:00:00.000Z");
  });

  it("accepts the current shift during its first hour only", () => {
    const start = new Date("2026-12-03T07:00:00Z");
    const h = resolveHandover(utc12, start, new Date("2026-12-03T07:05:00Z"));
    expect(iso(h.outgoing.startsAt)).toBe("2026-12-02T19:00:00.000Z");
    expect(iso(h.incoming.startsAt)).toBe("2026-12-03T07:00:00.000Z");
    expect(() => resolveHandover(utc12, start, new Date("2026-12-03T08:00:00Z"))).toThrow(
      /Only the handover to the next shift/,
    );
  });

  it("refuses a time that is not a shift start, naming the unit's pattern", () => {
    const call = () => resolveHandover(utc12, new Date("2026-12-03T19:30:00Z"), now);
    expect(call).toThrow(ValidationError);
    expect(call).toThrow(/shifts start at 07:00, every 12 h/);
  });

  it("refuses a later or an earlier shift", () => {
    expect(() => resolveHandover(utc12, new Date("2026-12-04T07:00:00Z"), now)).toThrow(
      ValidationError,
    );
    expect(() => resolveHandover(utc12, new Date("2026-12-02T19:00:00Z"), now)).toThrow(
      ValidationError,
    );
  });

  it("offers the just-started shift's handover only in its first hour", () => {
    expect(iso(lateHandover(utc12, new Date("2026-12-03T19:59:00Z"))!.incoming.startsAt)).toBe(
      "2026-12-03T19:00:00.000Z",
    );
    expect(lateHandover(utc12, new Date("2026-12-03T20:00:00Z"))).toBeNull();
  });

  it("measures the outgoing shift from its start to now, never past its end", () => {
    const h = resolveHandover(utc12, "next", now);
    expect(outgoingWindow(h, now)).toEqual({ from: h.outgoing.startsAt, to: now });
    const late = resolveHandover(
      utc12,
      new Date("2026-12-03T19:00:00Z"),
      new Date("2026-12-03T19:10:00Z"),
    );
    expect(iso(outgoingWindow(late, new Date("2026-12-03T19:10:00Z")).to)).toBe(
      "2026-12-03T19:00:00.000Z",
    );
  });
});

describe("the handoff inputs", () => {
  it('defaults the shift to "next" and reads an ISO start as an instant', () => {
    expect(handoffQuerySchema.parse({ unitId: "3" })).toEqual({ unitId: 3, shift: "next" });
    const parsed = handoffQuerySchema.parse({ unitId: 3, shift: "2026-12-03T19:00:00Z" });
    expect(parsed.shift).toEqual(new Date("2026-12-03T19:00:00Z"));
  });

  it("refuses a shift that is neither next nor an ISO instant, naming the field", () => {
    const r = handoffQuerySchema.safeParse({ unitId: 3, shift: "tomorrow" });
    expect(r.success).toBe(false);
    expect(r.error!.issues[0]!.path).toEqual(["shift"]);
    expect(r.error!.issues[0]!.message).toMatch(/"next" or the ISO start of a shift/);
  });

  it("takes 1 to 100 admission ids", () => {
    const base = { unitId: 1 };
    expect(handoffAcknowledgeSchema.safeParse({ ...base, admissionIds: [] }).success).toBe(false);
    expect(handoffAcknowledgeSchema.safeParse({ ...base, admissionIds: [0] }).success).toBe(false);
    expect(
      handoffAcknowledgeSchema.safeParse({
        ...base,
        admissionIds: Array.from({ length: 101 }, (_, i) => i + 1),
      }).success,
    ).toBe(false);
    expect(
      handoffAcknowledgeSchema.parse({ ...base, admissionIds: [4, 5], shift: "next" }),
    ).toMatchObject({ admissionIds: [4, 5], shift: "next" });
  });
});

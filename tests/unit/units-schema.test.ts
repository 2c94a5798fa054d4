import { describe, expect, it } from "vitest";
import { DEVICES } from "@/lib/devices";
import {
  bedCreateSchema,
  bedUpdateSchema,
  unitCreateSchema,
  unitUpdateSchema,
  type UnitCreateInput,
} from "@/lib/units/schema";
import { toFieldErrors } from "@/lib/validation";

const valid: UnitCreateInput = {
  code: "CCU2",
  name: "Cardiac Care",
  kind: "icu",
  altitudeM: 40,
  timeZone: "America/Chicago",
  shiftStart: "19:00",
  shiftHours: 12,
  allowedDevices: ["hfnc", "nasal_cannula"],
};

/** The field errors of an input that must be refused. */
function refusal(over: Record<string, unknown>): Record<string, string[]> {
  const parsed = unitCreateSchema.safeParse({ ...valid, ...over });
  if (parsed.success) throw new Error(`accepted ${JSON.stringify(over)}`);
  return toFieldErrors(parsed.error);
}

describe("unit schema", () => {
  it("accepts a valid unit, upper-cases the code and orders the devices as lib/devices does", () => {
    const data = unitCreateSchema.parse({ ...valid, code: " ccu2 " });
    expect(data.code).toBe("CCU2");
    expect(data.allowedDevices).toEqual(["nasal_cannula", "hfnc"]);
    expect(data.fallbackEmail).toBe("");
    expect(data.initialBeds).toBe(0);
  });

  it("takes codes of 2 to 16 letters or digits only", () => {
    expect(refusal({ code: "M" }).code?.[0]).toContain("2 to 16");
    expect(refusal({ code: "A".repeat(17) }).code?.[0]).toContain("2 to 16");
    expect(refusal({ code: "MI-CU" }).code?.[0]).toContain("letters or digits");
    expect(unitCreateSchema.safeParse({ ...valid, code: "A".repeat(16) }).success).toBe(true);
  });

  it("takes altitudes from -500 to 5500 m, whole metres, as the database's check", () => {
    for (const altitudeM of [-500, 0, 5500]) {
      expect(unitCreateSchema.safeParse({ ...valid, altitudeM }).success).toBe(true);
    }
    for (const altitudeM of [-501, 5501, 12.5, Number.NaN]) {
      expect(refusal({ altitudeM }).altitudeM?.[0]).toBe(
        "Altitude must be a whole number of metres from -500 to 5500.",
      );
    }
  });

  it("takes known IANA time zones only", () => {
    expect(unitCreateSchema.safeParse({ ...valid, timeZone: "Asia/Kathmandu" }).success).toBe(true);
    expect(unitCreateSchema.safeParse({ ...valid, timeZone: "UTC" }).success).toBe(true);
    for (const timeZone of ["Europe/Atlantis", "", "GMT+25", "not a zone"]) {
      expect(refusal({ timeZone }).timeZone?.[0]).toContain("IANA");
    }
  });

  it("takes a shift start as HH:MM from 00:00 to 23:59", () => {
    for (const shiftStart of ["00:00", "07:30", "23:59"]) {
      expect(unitCreateSchema.safeParse({ ...valid, shiftStart }).success).toBe(true);
    }
    for (const shiftStart of ["24:00", "7:00", "07:60", "07:00:00", ""]) {
      expect(refusal({ shiftStart }).shiftStart?.[0]).toBe(
        "Shift start must be a time from 00:00 to 23:59 (HH:MM).",
      );
    }
  });

  it("takes shifts of 6, 8, 12 or 24 hours", () => {
    for (const shiftHours of [6, 8, 12, 24]) {
      expect(unitCreateSchema.safeParse({ ...valid, shiftHours }).success).toBe(true);
    }
    for (const shiftHours of [0, 7, 10, 48, "12"]) {
      expect(refusal({ shiftHours }).shiftHours?.[0]).toBe(
        "Shift length must be 6, 8, 12, 24 hours.",
      );
    }
  });

  it("needs at least one known device", () => {
    expect(refusal({ allowedDevices: [] }).allowedDevices?.[0]).toBe("Allow at least one device.");
    expect(refusal({ allowedDevices: ["iron_lung"] })["allowedDevices.0"]?.[0]).toContain(
      "Each device must be one of",
    );
    expect(
      unitCreateSchema.parse({ ...valid, allowedDevices: [...DEVICES] }).allowedDevices,
    ).toEqual([...DEVICES]);
  });

  it("takes an empty or valid fallback address", () => {
    expect(
      unitCreateSchema.parse({ ...valid, fallbackEmail: " Desk@Kestrel.Example " }).fallbackEmail,
    ).toBe("desk@kestrel.example");
    expect(refusal({ fallbackEmail: "desk" }).fallbackEmail?.[0]).toBe(
      "Fallback e-mail must be a valid e-mail address.",
    );
  });

  it("takes 0 to 60 initial beds", () => {
    expect(refusal({ initialBeds: 61 }).initialBeds?.[0]).toContain("0 to 60");
    expect(refusal({ initialBeds: -1 }).initialBeds?.[0]).toContain("0 to 60");
  });

  it("has no code on an edit, and needs the version", () => {
    const { code: _code, ...fields } = valid;
    void _code;
    const data = unitUpdateSchema.parse({ ...fields, code: "IGNORED", unitId: 3, version: 2 });
    expect(data).not.toHaveProperty("code");
    expect(unitUpdateSchema.safeParse({ ...fields, unitId: 3 }).success).toBe(false);
  });
});

describe("bed schemas", () => {
  it("takes labels of 1 to 16 characters, trimmed", () => {
    expect(bedCreateSchema.parse({ unitId: 1, label: " 12A " }).label).toBe("12A");
    for (const label of ["", "   ", "x".repeat(17)]) {
      const parsed = bedCreateSchema.safeParse({ unitId: 1, label });
      expect(parsed.success).toBe(false);
      expect(toFieldErrors(parsed.error!).label?.[0]).toBe("Bed label must be 1 to 16 characters.");
    }
  });

  it("needs a new label or an active flag on an update", () => {
    expect(bedUpdateSchema.safeParse({ unitId: 1, bedId: 2, active: false }).success).toBe(true);
    expect(bedUpdateSchema.safeParse({ unitId: 1, bedId: 2, label: "B" }).success).toBe(true);
    const parsed = bedUpdateSchema.safeParse({ unitId: 1, bedId: 2 });
    expect(parsed.success).toBe(false);
    expect(toFieldErrors(parsed.error!).label?.[0]).toContain("Give a new label");
    expect(bedUpdateSchema.safeParse({ unitId: 1, bedId: 2, active: "no" }).success).toBe(false);
  });
});

import { describe, expect, it } from "vitest";
import { cellsToCopy, chargeToCopy, fitsDuty } from "@/lib/assignments/copy";
import {
  assignWords,
  mayAssign,
  ONLY_CHARGE_OR_ADMIN,
  placeOf,
} from "@/lib/assignments/may-assign";
import { assignmentReadSchema, assignmentWriteSchema } from "@/lib/assignments/schema";

const staff = [
  { id: 1, name: "Nurse One", role: "nurse" },
  { id: 2, name: "Nurse Two", role: "nurse" },
  { id: 3, name: "Therapist", role: "therapist" },
  { id: 4, name: "Physician", role: "physician" },
];

describe("who may set a shift's assignments", () => {
  it("lets admins and the current charge nurse set the current and next shift", () => {
    for (const place of ["current", "next"] as const) {
      expect(mayAssign({ role: "admin", isCurrentCharge: false, place })).toEqual({
        allowed: true,
        basis: "admin",
      });
      expect(mayAssign({ role: "nurse", isCurrentCharge: true, place })).toEqual({
        allowed: true,
        basis: "charge",
      });
    }
  });

  it("refuses other nurses and other roles with 403, saying who assigns", () => {
    expect(mayAssign({ role: "nurse", isCurrentCharge: false, place: "next" })).toEqual({
      allowed: false,
      status: 403,
      reason: ONLY_CHARGE_OR_ADMIN,
    });
    // A charge duty does not lift a role the table leaves out.
    expect(mayAssign({ role: "physician", isCurrentCharge: true, place: "current" })).toMatchObject(
      {
        allowed: false,
        status: 403,
      },
    );
  });

  it("refuses past shifts as history and shifts after the next, even to admins", () => {
    const past = mayAssign({ role: "admin", isCurrentCharge: false, place: "past" });
    expect(past).toMatchObject({ allowed: false, status: 400 });
    expect(assignWords(past)).toMatch(/past shifts are history/);
    expect(mayAssign({ role: "nurse", isCurrentCharge: true, place: "later" })).toMatchObject({
      allowed: false,
      status: 400,
    });
  });

  it("words why one may edit", () => {
    expect(assignWords({ allowed: true, basis: "charge" })).toMatch(/charge nurse/);
    expect(assignWords({ allowed: true, basis: "admin" })).toMatch(/administrator/);
  });

  it("places a shift against the current and next one", () => {
    const at = (h: number) => new Date(Date.UTC(2026, 11, 3, h));
    const current = { startsAt: at(7) };
    const next = { startsAt: at(19) };
    expect(placeOf(at(7), current, next)).toBe("current");
    expect(placeOf(at(19), current, next)).toBe("next");
    expect(placeOf(at(-5), current, next)).toBe("past");
    expect(placeOf(at(31), current, next)).toBe("later");
  });
});

describe("copying a shift", () => {
  it("fills only the empty cells, of active beds, with people still of the duty's role", () => {
    const copied = cellsToCopy({
      source: [
        { bedId: 10, duty: "nurse", userId: 1 },
        { bedId: 10, duty: "therapist", userId: 3 },
        { bedId: 11, duty: "nurse", userId: 9 }, // no longer on the unit
        { bedId: 12, duty: "physician", userId: 4 }, // bed retired
        { bedId: 11, duty: "therapist", userId: 2 }, // a nurse in a therapist's cell
      ],
      target: [{ bedId: 10, duty: "nurse", userId: 2 }],
      bedIds: [10, 11],
      staff,
    });
    expect(copied).toEqual([{ bedId: 10, duty: "therapist", userId: 3 }]);
  });

  it("carries the charge nurse over only into an empty charge duty, and only a nurse of the unit", () => {
    expect(chargeToCopy({ source: 1, target: null, staff })).toBe(1);
    expect(chargeToCopy({ source: 1, target: 2, staff })).toBeNull();
    expect(chargeToCopy({ source: 3, target: null, staff })).toBeNull();
    expect(chargeToCopy({ source: null, target: null, staff })).toBeNull();
    expect(fitsDuty(staff, 4, "physician")).toBe(true);
    expect(fitsDuty(staff, 4, "nurse")).toBe(false);
  });
});

describe("the assignments schemas", () => {
  it("reads current by default, and a shift's ISO start as a date", () => {
    expect(assignmentReadSchema.parse({ unitId: 1 })).toEqual({ unitId: 1, shift: "current" });
    const parsed = assignmentReadSchema.parse({ unitId: 1, shift: "2026-12-03T07:00:00Z" });
    expect(parsed.shift).toEqual(new Date("2026-12-03T07:00:00Z"));
  });

  it("refuses previous and odd shifts for a write, naming the field", () => {
    for (const shift of ["previous", "tomorrow", "2026-13-03T07:00:00Z", 7]) {
      const result = assignmentWriteSchema.safeParse({ unitId: 1, shift, cells: [] });
      expect(result.success).toBe(false);
      expect(result.error?.issues[0]?.path).toEqual(["shift"]);
    }
  });

  it("names the cell whose bed, duty or user is malformed", () => {
    const result = assignmentWriteSchema.safeParse({
      unitId: 1,
      shift: "next",
      cells: [
        { bedId: 1, duty: "nurse", userId: null },
        { bedId: 1, duty: "cook", userId: 2 },
      ],
    });
    expect(result.error?.issues.map((i) => i.path.join("."))).toEqual(["cells.1.duty"]);
    expect(result.error?.issues[0]?.message).toBe(
      "Duty must be one of: nurse, therapist, physician.",
    );
  });

  it("accepts an empty body of cells with a copy from the previous shift, and null to clear the charge nurse", () => {
    expect(
      assignmentWriteSchema.parse({
        unitId: 1,
        shift: "next",
        copyFrom: "previous",
        chargeNurseId: null,
      }),
    ).toMatchObject({ cells: [], copyFrom: "previous", chargeNurseId: null });
  });
});

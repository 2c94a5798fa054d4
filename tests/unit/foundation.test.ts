import { describe, expect, it } from "vitest";
import { duplicateIndex } from "@/lib/db-errors";
import {
  deriveLedgerKeys,
  GENESIS_HASH,
  keyedLedgerHash,
  type HashedLedgerFields,
} from "@/lib/ledger/hash";
import { ageInYears, initialsOf } from "@/lib/admissions/display";
import { resolveUnitChoice } from "@/lib/preferences/unit";
import { userCreateSchema, userUpdateSchema } from "@/lib/users/schema";
import { toFieldErrors } from "@/lib/validation";

describe("unit choice", () => {
  it("keeps a chosen unit the user is assigned to", () => {
    expect(resolveUnitChoice("2", [1, 2])).toEqual({ choice: 2, unitIds: [2] });
  });
  it("falls back to all of the user's units for a unit they are not assigned to, or garbage", () => {
    expect(resolveUnitChoice("3", [1, 2])).toEqual({ choice: "all", unitIds: [1, 2] });
    expect(resolveUnitChoice("drop table", [1])).toEqual({ choice: "all", unitIds: [1] });
    expect(resolveUnitChoice(undefined, [])).toEqual({ choice: "all", unitIds: [] });
  });
});

describe("patient display", () => {
  it("shows initials only", () => {
    expect(initialsOf("cosima", " Ashcombe")).toBe("C.A.");
  });
  it("counts age in whole years, turning over on the birthday", () => {
    const birth = new Date("1960-03-15T00:00:00Z");
    expect(ageInYears(birth, new Date("2026-03-14T23:59:00Z"))).toBe(65);
    expect(ageInYears(birth, new Date("2026-03-15T00:00:00Z"))).toBe(66);
  });
});

describe("ledger hash", () => {
  const keys = deriveLedgerKeys("a-test-ledger-key-of-at-least-32-chars");
  const hashLedgerEntry = (f: HashedLedgerFields) => keyedLedgerHash(keys, f);
  const base: HashedLedgerFields = {
    chainKey: "patient:7",
    chainSeq: 3,
    prevHash: GENESIS_HASH,
    actorUserId: 2,
    actorRole: "therapist",
    occurredAt: new Date("2026-12-01T10:00:00.123Z"),
    action: "user.update",
    entityType: "user",
    entityId: "9",
    patientId: 7,
    unitId: 1,
    beforeJson: '{"a":1}',
    afterJson: '{"a":2}',
    rationale: "reason",
  };

  it("is a 64-character hex HMAC-SHA256 and stable for the same fields", () => {
    expect(hashLedgerEntry(base)).toMatch(/^[0-9a-f]{64}$/);
    expect(hashLedgerEntry({ ...base })).toBe(hashLedgerEntry(base));
  });

  it.each(Object.keys(base) as (keyof HashedLedgerFields)[])("changes when %s changes", (key) => {
    const changed = { ...base } as Record<string, unknown>;
    const v = base[key];
    changed[key] =
      v instanceof Date
        ? new Date(v.getTime() + 1)
        : typeof v === "number"
          ? v + 1
          : `${String(v)}x`;
    expect(hashLedgerEntry(changed as HashedLedgerFields)).not.toBe(hashLedgerEntry(base));
  });

  it("cannot be forged by moving text across a field boundary", () => {
    const a = hashLedgerEntry({ ...base, action: "ab", entityType: "c" });
    const b = hashLedgerEntry({ ...base, action: "a", entityType: "bc" });
    expect(a).not.toBe(b);
  });
});

describe("user schemas", () => {
  const valid = {
    email: "  Someone@Kestrel.Example ",
    name: "Some One",
    role: "nurse",
    unitIds: [1],
    pressureUnit: "kPa",
    password: "twelve-chars!",
    rationale: "",
    currentPassword: "the-admins-own",
  };

  it("normalises the e-mail to trimmed lower case", () => {
    expect(userCreateSchema.parse(valid).email).toBe("someone@kestrel.example");
  });

  it("names each refused field with its allowed range in words", () => {
    const result = userCreateSchema.safeParse({
      ...valid,
      role: "wizard",
      password: "short",
      unitIds: [],
    });
    expect(result.success).toBe(false);
    const fields = toFieldErrors(result.error!);
    expect(fields.role?.[0]).toMatch(/physician, therapist, nurse, reviewer, admin/);
    expect(fields.password?.[0]).toBe("Password must be 12 to 200 characters.");
    expect(fields.unitIds?.[0]).toBe("Assign at least one unit.");
  });

  it("lets an edit keep the password by leaving it empty, but not set a short one", () => {
    const edit = { ...valid, id: 1, version: 1 };
    expect(userUpdateSchema.safeParse({ ...edit, password: "" }).success).toBe(true);
    expect(userUpdateSchema.safeParse({ ...edit, password: "short" }).success).toBe(false);
    expect(userCreateSchema.safeParse({ ...valid, password: "" }).success).toBe(false);
  });

  it("asks for the administrator's own password on every change", () => {
    const result = userCreateSchema.safeParse({ ...valid, currentPassword: "" });
    expect(toFieldErrors(result.error!).currentPassword).toEqual([
      "Enter your own password to confirm the change.",
    ]);
  });
});

describe("database error translation", () => {
  it("names the unique index a duplicate hit", () => {
    const error = {
      code: "ER_DUP_ENTRY",
      errno: 1062,
      sqlMessage: "Duplicate entry 'a@b.example' for key 'users_email_unique'",
    };
    expect(duplicateIndex(error)).toBe("users_email_unique");
    expect(duplicateIndex({ code: "ER_LOCK_DEADLOCK" })).toBeUndefined();
    expect(duplicateIndex(new Error("plain"))).toBeUndefined();
  });
});

import {
  createUserOperation,
  setUserActiveOperation,
  updateUserOperation,
} from "@/lib/users/operations";
import { afterAll, describe, expect, it } from "vitest";
import { closeDb } from "@/lib/db";
import { ConflictError, ForbiddenError, ValidationError } from "@/lib/errors";
import type { UserCreateInput } from "@/lib/users/schema";
import { actorByEmail, appDb, SEEDED, uniqueEmail } from "../helpers/db";

afterAll(async () => {
  await closeDb();
});

/** The seeded administrator's (documented demo) password, re-entered for each change. */
const ADMIN_PASSWORD = "tidemark-demo";

async function unitId(code: string): Promise<number> {
  const row = (await appDb()("units").where({ code }).first("id")) as { id: number };
  return row.id;
}

async function newUserInput(over: Partial<UserCreateInput> = {}): Promise<UserCreateInput> {
  return {
    email: uniqueEmail(),
    name: "Test Person",
    role: "nurse",
    unitIds: [await unitId("MICU")],
    pressureUnit: "mmHg",
    password: "a-long-enough-password",
    rationale: "integration test",
    currentPassword: ADMIN_PASSWORD,
    ...over,
  };
}

async function ledgerRowsFor(userId: number) {
  return (await appDb()("ledger_entries")
    .where({ entity_type: "user", entity_id: String(userId) })
    .orderBy("id")) as {
    action: string;
    actor_role: string;
    before_json: string | null;
    after_json: string;
  }[];
}

describe("user administration", () => {
  it("creates a user and its ledger row in the same transaction, without the password hash", async () => {
    const admin = await actorByEmail(SEEDED.admin);
    const input = await newUserInput();
    const user = await createUserOperation.invoke(appDb(), admin, input);
    expect(user).toMatchObject({ email: input.email, role: "nurse", active: true, version: 1 });
    const rows = await ledgerRowsFor(user.id);
    expect(rows).toHaveLength(1);
    expect(rows[0]).toMatchObject({
      action: "user.create",
      actor_role: "admin",
      before_json: null,
    });
    expect(rows[0]!.after_json).not.toContain("password");
    expect(JSON.parse(rows[0]!.after_json)).toMatchObject({
      email: input.email,
      unitIds: input.unitIds,
    });
  });

  it("refuses a nurse, and writes nothing", async () => {
    const nurse = await actorByEmail(SEEDED.nurse);
    const input = await newUserInput();
    await expect(createUserOperation.invoke(appDb(), nurse, input)).rejects.toBeInstanceOf(
      ForbiddenError,
    );
    expect(await appDb()("users").where({ email: input.email }).first()).toBeUndefined();
  });

  it("refuses malformed and oversized fields, naming each field", async () => {
    const admin = await actorByEmail(SEEDED.admin);
    const input = await newUserInput({
      email: "not-an-email",
      name: "x".repeat(121),
      password: "short",
      unitIds: [],
    });
    const error = await createUserOperation.invoke(appDb(), admin, input).catch((e: unknown) => e);
    expect(error).toBeInstanceOf(ValidationError);
    const fields = (error as ValidationError).fieldErrors ?? {};
    expect(Object.keys(fields).sort()).toEqual(["email", "name", "password", "unitIds"]);
    expect(fields.name?.[0]).toMatch(/2 to 120 characters/);
  });

  it("refuses an unknown unit with a field error and leaves no half-written user", async () => {
    const admin = await actorByEmail(SEEDED.admin);
    const input = await newUserInput({ unitIds: [999_999] });
    await expect(createUserOperation.invoke(appDb(), admin, input)).rejects.toMatchObject({
      fieldErrors: { unitIds: [expect.stringMatching(/do not exist/)] },
    });
    expect(await appDb()("users").where({ email: input.email }).first()).toBeUndefined();
  });

  it("turns a duplicate e-mail into a conflict on the e-mail field", async () => {
    const admin = await actorByEmail(SEEDED.admin);
    const input = await newUserInput();
    await createUserOperation.invoke(appDb(), admin, input);
    const again = await createUserOperation
      .invoke(appDb(), admin, { ...input, email: input.email.toUpperCase() })
      .catch((e: unknown) => e);
    expect(again).toBeInstanceOf(ConflictError);
    expect((again as ConflictError).fieldErrors?.email).toBeDefined();
  });

  it("lets exactly one of two edits from the same version win", async () => {
    const admin = await actorByEmail(SEEDED.admin);
    const user = await createUserOperation.invoke(appDb(), admin, await newUserInput());
    const base = {
      id: user.id,
      version: user.version,
      email: user.email,
      role: user.role,
      unitIds: user.units.map((u) => u.id),
      pressureUnit: user.pressureUnit,
      password: "",
      rationale: "",
      currentPassword: ADMIN_PASSWORD,
    };
    const results = await Promise.allSettled([
      updateUserOperation.invoke(appDb(), admin, { ...base, name: "First Editor" }),
      updateUserOperation.invoke(appDb(), admin, { ...base, name: "Second Editor" }),
    ]);
    expect(results.filter((r) => r.status === "fulfilled")).toHaveLength(1);
    const rejected = results.find((r) => r.status === "rejected");
    expect(rejected?.reason).toBeInstanceOf(ConflictError);
    const rows = await ledgerRowsFor(user.id);
    expect(rows.map((r) => r.action)).toEqual(["user.create", "user.update"]);
  });

  it("deactivates with a required reason; a deactivated user's actor no longer loads", async () => {
    const admin = await actorByEmail(SEEDED.admin);
    const user = await createUserOperation.invoke(appDb(), admin, await newUserInput());
    await expect(
      setUserActiveOperation.invoke(appDb(), admin, {
        id: user.id,
        version: 1,
        active: false,
        rationale: "",
        currentPassword: ADMIN_PASSWORD,
      }),
    ).rejects.toMatchObject({ fieldErrors: { rationale: [expect.any(String)] } });
    const after = await setUserActiveOperation.invoke(appDb(), admin, {
      id: user.id,
      version: 1,
      active: false,
      rationale: "left the unit",
      currentPassword: ADMIN_PASSWORD,
    });
    expect(after.active).toBe(false);
    await expect(actorByEmail(user.email)).rejects.toMatchObject({ status: 401 });
    const rows = await ledgerRowsFor(user.id);
    expect(rows.at(-1)).toMatchObject({ action: "user.deactivate" });
  });

  it("refuses to let an administrator deactivate themselves or drop their own admin role", async () => {
    const admin = await actorByEmail(SEEDED.admin);
    const self = (await appDb()("users").where({ id: admin.id }).first("version")) as {
      version: number;
    };
    await expect(
      setUserActiveOperation.invoke(appDb(), admin, {
        id: admin.id,
        version: self.version,
        active: false,
        rationale: "oops",
        currentPassword: ADMIN_PASSWORD,
      }),
    ).rejects.toBeInstanceOf(ValidationError);
    await expect(
      updateUserOperation.invoke(appDb(), admin, {
        id: admin.id,
        version: self.version,
        email: admin.email,
        name: admin.name,
        role: "nurse",
        unitIds: admin.unitIds,
        pressureUnit: "mmHg",
        password: "",
        rationale: "",
        currentPassword: ADMIN_PASSWORD,
      }),
    ).rejects.toMatchObject({ fieldErrors: { role: [expect.any(String)] } });
  });

  it("asks the administrator's own password for every account change, and records a wrong one", async () => {
    const admin = await actorByEmail(SEEDED.admin);
    const input = await newUserInput({ currentPassword: "not-my-password" });
    const error = (await createUserOperation
      .invoke(appDb(), admin, input)
      .catch((e: unknown) => e)) as ValidationError;
    expect(error).toBeInstanceOf(ValidationError);
    expect(error.fieldErrors).toEqual({
      currentPassword: ["The password does not match your account."],
    });
    expect(await appDb()("users").where({ email: input.email }).first("id")).toBeUndefined();
    const refused = (await appDb()("ledger_entries")
      .where({ action: "user.reauth_refused", entity_id: String(admin.id) })
      .count({ n: "*" })
      .first()) as { n: number };
    expect(Number(refused.n)).toBeGreaterThan(0);
    const withoutPassword: Partial<UserCreateInput> = await newUserInput();
    delete withoutPassword.currentPassword;
    await expect(
      createUserOperation.invoke(appDb(), admin, withoutPassword as UserCreateInput),
    ).rejects.toMatchObject({
      fieldErrors: { currentPassword: ["Enter your own password to confirm the change."] },
    });
  });
});

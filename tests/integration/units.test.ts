import { randomUUID } from "node:crypto";
import { afterAll, describe, expect, it } from "vitest";
import { hashPassword } from "@/lib/auth/password";
import type { Role } from "@/lib/auth/roles";
import { loadActor } from "@/lib/auth/actor-queries";
import { closeDb } from "@/lib/db";
import { DEVICES } from "@/lib/devices";
import { ConflictError, ForbiddenError, NotFoundError, ValidationError } from "@/lib/errors";
import { writeOrderOperation } from "@/lib/orders/operations";
import { listBeds, listUnitOverviews } from "@/lib/units/queries";
import {
  createBedOperation,
  createUnitOperation,
  listUnitsOperation,
  updateBedOperation,
  updateUnitOperation,
} from "@/lib/units/operations";
import type { UnitCreateInput } from "@/lib/units/schema";
import { actorByEmail, appDb, SEEDED, uniqueEmail } from "../helpers/db";
import { hfncOrder } from "../helpers/orders";

afterAll(async () => {
  await closeDb();
});

const DEMO_PASSWORD = "tidemark-demo";

/** A fresh code per test: 2–16 upper-case letters or digits. */
const freshCode = () => `T${randomUUID().replace(/-/g, "").slice(0, 10).toUpperCase()}`;

function unitInput(over: Partial<UnitCreateInput> = {}): UnitCreateInput {
  return {
    code: freshCode(),
    name: "Test Step-down Unit",
    kind: "ward",
    altitudeM: 120,
    timeZone: "Europe/Amsterdam",
    shiftStart: "07:30",
    shiftHours: 8,
    allowedDevices: ["nasal_cannula", "venturi_mask", "hfnc"],
    fallbackEmail: "stepdown-desk@kestrel.example",
    rationale: "integration test",
    ...over,
  };
}

let passwordHash: Promise<string> | undefined;
/** A fresh user of a role on the given units, with the demo password. */
async function freshUser(role: Role, unitIds: number[]) {
  passwordHash ??= hashPassword(DEMO_PASSWORD);
  const [id] = await appDb()("users").insert({
    email: uniqueEmail(`units-${role}`),
    name: `Units ${role}`,
    role,
    password_hash: await passwordHash,
  });
  if (unitIds.length) {
    await appDb()("user_units").insert(unitIds.map((u) => ({ user_id: Number(id), unit_id: u })));
  }
  return loadActor(appDb(), Number(id));
}

async function unitIdOf(code: string): Promise<number> {
  return ((await appDb()("units").where({ code }).first("id")) as { id: number }).id;
}

async function ledgerRows(entityType: string, entityId: number) {
  return (await appDb()("ledger_entries")
    .where({ entity_type: entityType, entity_id: String(entityId) })
    .orderBy("id")
    .select("action", "chain_key", "unit_id", "patient_id", "before_json", "after_json")) as {
    action: string;
    chain_key: string;
    unit_id: number | null;
    patient_id: number | null;
    before_json: string | null;
    after_json: string | null;
  }[];
}

/** A new unit of a fresh admin (who becomes its member), with two beds. */
async function newUnitWithAdmin(over: Partial<UnitCreateInput> = {}) {
  const fresh = await freshUser("admin", []);
  const unit = await createUnitOperation.invoke(appDb(), fresh, unitInput(over));
  const admin = await loadActor(appDb(), fresh.id);
  return { admin, unit };
}

/** A patient admitted to the bed. */
async function admit(bedId: number) {
  const tag = randomUUID().slice(0, 8).toUpperCase();
  const [patientId] = await appDb()("patients").insert({
    mrn: `UNT${tag}`,
    family_name: "Brandvold",
    given_name: "Oskar",
    birth_date: "1958-03-02",
    sex: "male",
    height_cm: 180,
  });
  await appDb()("admissions").insert({
    patient_id: patientId,
    bed_id: bedId,
    admitted_at: new Date(Date.now() - 3600_000),
  });
  return { patientId: Number(patientId), mrn: `UNT${tag}` };
}

describe("unit administration", () => {
  it("creates a unit with its beds, makes the creator a member, and writes one ledger row", async () => {
    const fresh = await freshUser("admin", []);
    const input = unitInput({ initialBeds: 3, code: freshCode().toLowerCase() });
    const unit = await createUnitOperation.invoke(appDb(), fresh, input);
    expect(unit).toMatchObject({
      code: input.code.toUpperCase(),
      kind: "ward",
      altitudeM: 120,
      timeZone: "Europe/Amsterdam",
      shiftStart: "07:30",
      shiftHours: 8,
      allowedDevices: ["nasal_cannula", "venturi_mask", "hfnc"],
      fallbackEmail: "stepdown-desk@kestrel.example",
      version: 1,
    });
    const admin = await loadActor(appDb(), fresh.id);
    expect(admin.unitIds).toContain(unit.id);
    expect((await listBeds(appDb(), unit.id)).map((b) => b.label)).toEqual(["1", "2", "3"]);
    const rows = await ledgerRows("unit", unit.id);
    expect(rows).toHaveLength(1);
    expect(rows[0]).toMatchObject({
      action: "unit.create",
      chain_key: "admin",
      unit_id: unit.id,
      patient_id: null,
      before_json: null,
    });
    expect(JSON.parse(rows[0]!.after_json!)).toMatchObject({
      code: unit.code,
      allowedDevices: ["nasal_cannula", "venturi_mask", "hfnc"],
      beds: ["1", "2", "3"],
    });
    // The list of the actor's units shows it with its counts.
    const listed = await listUnitsOperation.invoke(appDb(), admin, {});
    expect(listed.find((u) => u.id === unit.id)).toMatchObject({
      beds: 3,
      occupiedBeds: 0,
      retiredBeds: 0,
    });
  });

  it("refuses a duplicate code with a 409 naming it, and writes nothing", async () => {
    const admin = await actorByEmail(SEEDED.admin);
    const before = await appDb()("ledger_entries").max({ id: "id" }).first();
    const error = await createUnitOperation
      .invoke(appDb(), admin, unitInput({ code: "micu" }))
      .catch((e: unknown) => e);
    expect(error).toBeInstanceOf(ConflictError);
    expect((error as ConflictError).message).toContain("MICU");
    expect((error as ConflictError).fieldErrors?.code?.[0]).toContain("MICU");
    expect(await appDb()("units").where({ code: "MICU" }).count({ n: "*" }).first()).toEqual({
      n: 1,
    });
    const after = await appDb()("ledger_entries").max({ id: "id" }).first();
    // Other tests may write meanwhile; none of their rows is a unit.create of MICU.
    const rows = (await appDb()("ledger_entries")
      .where("id", ">", (before as { id: number }).id)
      .where("id", "<=", (after as { id: number }).id)
      .where({ action: "unit.create" })
      .select("after_json")) as { after_json: string }[];
    expect(rows.some((r) => r.after_json.includes('"code":"MICU"'))).toBe(false);
  });

  it("refuses a non-admin at the operation's door, and writes nothing", async () => {
    const nurse = await actorByEmail(SEEDED.nurse);
    const input = unitInput();
    await expect(createUnitOperation.invoke(appDb(), nurse, input)).rejects.toBeInstanceOf(
      ForbiddenError,
    );
    expect(await appDb()("units").where({ code: input.code }).first()).toBeUndefined();
    const micu = await unitIdOf("MICU");
    const physician = await actorByEmail(SEEDED.physician);
    await expect(
      createBedOperation.invoke(appDb(), physician, { unitId: micu, label: "X1" }),
    ).rejects.toBeInstanceOf(ForbiddenError);
  });

  it("refuses settings out of range, naming each field and its range", async () => {
    const admin = await actorByEmail(SEEDED.admin);
    const error = await createUnitOperation
      .invoke(
        appDb(),
        admin,
        unitInput({
          altitudeM: 6000,
          timeZone: "Mars/Olympus_Mons",
          shiftStart: "7:00",
          shiftHours: 10,
          allowedDevices: [],
          fallbackEmail: "not-an-address",
        }),
      )
      .catch((e: unknown) => e);
    expect(error).toBeInstanceOf(ValidationError);
    const fields = (error as ValidationError).fieldErrors!;
    expect(fields.altitudeM?.[0]).toContain("-500 to 5500");
    expect(fields.timeZone?.[0]).toContain("IANA");
    expect(fields.shiftStart?.[0]).toContain("HH:MM");
    expect(fields.shiftHours?.[0]).toContain("6, 8, 12, 24");
    expect(fields.allowedDevices?.[0]).toContain("at least one");
    expect(fields.fallbackEmail?.[0]).toContain("valid e-mail");
  });

  it("edits a unit's settings, keeps its code, and writes before and after to the ledger", async () => {
    const { admin, unit } = await newUnitWithAdmin();
    const result = await updateUnitOperation.invoke(appDb(), admin, {
      ...unitInput({ name: "Renamed Step-down", shiftHours: 12, fallbackEmail: "" }),
      unitId: unit.id,
      version: unit.version,
    });
    expect(result.unit).toMatchObject({
      code: unit.code,
      name: "Renamed Step-down",
      shiftHours: 12,
      fallbackEmail: null,
      version: 2,
    });
    expect(result.warnings).toEqual([]);
    const rows = await ledgerRows("unit", unit.id);
    expect(rows.map((r) => r.action)).toEqual(["unit.create", "unit.update"]);
    expect(JSON.parse(rows[1]!.before_json!)).toMatchObject({ name: unit.name, version: 1 });
    expect(JSON.parse(rows[1]!.after_json!)).toMatchObject({ name: "Renamed Step-down" });
  });

  it("refuses an edit from a stale version with a 409, and changes nothing", async () => {
    const { admin, unit } = await newUnitWithAdmin();
    await updateUnitOperation.invoke(appDb(), admin, {
      ...unitInput({ name: "First edit" }),
      unitId: unit.id,
      version: 1,
    });
    const error = await updateUnitOperation
      .invoke(appDb(), admin, {
        ...unitInput({ name: "Second edit" }),
        unitId: unit.id,
        version: 1,
      })
      .catch((e: unknown) => e);
    expect(error).toBeInstanceOf(ConflictError);
    expect((error as ConflictError).message).toContain("changed by someone else");
    const row = (await appDb()("units").where({ id: unit.id }).first("name", "version")) as {
      name: string;
      version: number;
    };
    expect(row).toEqual({ name: "First edit", version: 2 });
  });

  it("answers 404 for a unit the admin is not a member of", async () => {
    const resp = await unitIdOf("RESP");
    const micuOnly = await freshUser("admin", [await unitIdOf("MICU")]);
    const version = (
      (await appDb()("units").where({ id: resp }).first("version")) as {
        version: number;
      }
    ).version;
    await expect(
      updateUnitOperation.invoke(appDb(), micuOnly, { ...unitInput(), unitId: resp, version }),
    ).rejects.toBeInstanceOf(NotFoundError);
    await expect(
      createBedOperation.invoke(appDb(), micuOnly, { unitId: resp, label: "R99" }),
    ).rejects.toBeInstanceOf(NotFoundError);
    const respBed = (await appDb()("beds").where({ unit_id: resp }).first("id")) as { id: number };
    await expect(
      updateBedOperation.invoke(appDb(), micuOnly, {
        unitId: resp,
        bedId: respBed.id,
        label: "R98",
      }),
    ).rejects.toBeInstanceOf(NotFoundError);
    // A bed of one's own unit named under another unit's id is not found either.
    const micuBed = (await appDb()("beds")
      .where({ unit_id: await unitIdOf("MICU") })
      .first("id")) as {
      id: number;
    };
    const seededAdmin = await actorByEmail(SEEDED.admin);
    await expect(
      updateBedOperation.invoke(appDb(), seededAdmin, {
        unitId: resp,
        bedId: micuBed.id,
        active: false,
      }),
    ).rejects.toBeInstanceOf(NotFoundError);
    expect(await appDb()("beds").where({ unit_id: resp, label: "R99" }).first()).toBeUndefined();
  });

  it("names the patients whose order in effect uses a device the unit no longer allows", async () => {
    const { admin, unit } = await newUnitWithAdmin();
    const bed = await createBedOperation.invoke(appDb(), admin, { unitId: unit.id, label: "A1" });
    const { patientId, mrn } = await admit(bed.id);
    const physician = await freshUser("physician", [unit.id]);
    await writeOrderOperation.invoke(appDb(), physician, hfncOrder(patientId));
    const result = await updateUnitOperation.invoke(appDb(), admin, {
      ...unitInput({ allowedDevices: ["nasal_cannula", "venturi_mask"] }),
      unitId: unit.id,
      version: unit.version,
    });
    // Not a refusal: the narrowing is saved, and the answer lists the patient.
    expect(result.unit.allowedDevices).toEqual(["nasal_cannula", "venturi_mask"]);
    expect(result.warnings).toEqual([
      expect.objectContaining({ patientId, mrn, bedLabel: "A1", device: "hfnc" }),
    ]);
  });
});

describe("bed administration", () => {
  it("adds a bed at the end of the unit's order, with its ledger row", async () => {
    const { admin, unit } = await newUnitWithAdmin({ initialBeds: 2 });
    const bed = await createBedOperation.invoke(appDb(), admin, { unitId: unit.id, label: " 3A " });
    expect(bed).toMatchObject({ unitId: unit.id, label: "3A", sortOrder: 3, active: true });
    const rows = await ledgerRows("bed", bed.id);
    expect(rows).toHaveLength(1);
    expect(rows[0]).toMatchObject({
      action: "bed.create",
      chain_key: "admin",
      unit_id: unit.id,
      patient_id: null,
    });
  });

  it("replays a bed added twice with one idempotency key", async () => {
    const { admin, unit } = await newUnitWithAdmin();
    const key = `bed-${randomUUID()}`;
    const first = await createBedOperation.invoke(appDb(), admin, {
      unitId: unit.id,
      label: "K1",
      idempotencyKey: key,
    });
    const again = await createBedOperation.invoke(appDb(), admin, {
      unitId: unit.id,
      label: "K1",
      idempotencyKey: key,
    });
    expect(again.id).toBe(first.id);
    expect(await listBeds(appDb(), unit.id)).toHaveLength(1);
  });

  it("refuses a label the unit already has with a 409 naming it (a retired bed too)", async () => {
    const { admin, unit } = await newUnitWithAdmin({ initialBeds: 2 });
    const error = await createBedOperation
      .invoke(appDb(), admin, { unitId: unit.id, label: "2" })
      .catch((e: unknown) => e);
    expect(error).toBeInstanceOf(ConflictError);
    expect((error as ConflictError).fieldErrors?.label?.[0]).toContain("bed 2");
    const [one] = await listBeds(appDb(), unit.id);
    await updateBedOperation.invoke(appDb(), admin, {
      unitId: unit.id,
      bedId: one!.id,
      active: false,
    });
    const retired = await createBedOperation
      .invoke(appDb(), admin, { unitId: unit.id, label: "1" })
      .catch((e: unknown) => e);
    expect(retired).toBeInstanceOf(ConflictError);
    expect((retired as ConflictError).message).toContain("retired bed 1");
    // Renaming onto another bed's label is the same refusal.
    const two = (await listBeds(appDb(), unit.id)).find((b) => b.label === "2")!;
    await expect(
      updateBedOperation.invoke(appDb(), admin, { unitId: unit.id, bedId: two.id, label: "1" }),
    ).rejects.toBeInstanceOf(ConflictError);
    expect(await appDb()("beds").where({ unit_id: unit.id }).count({ n: "*" }).first()).toEqual({
      n: 2,
    });
  });

  it("renames a bed, with before and after in the ledger", async () => {
    const { admin, unit } = await newUnitWithAdmin({ initialBeds: 1 });
    const [bed] = await listBeds(appDb(), unit.id);
    const renamed = await updateBedOperation.invoke(appDb(), admin, {
      unitId: unit.id,
      bedId: bed!.id,
      label: "W1",
    });
    expect(renamed.label).toBe("W1");
    const rows = await ledgerRows("bed", bed!.id);
    expect(rows.map((r) => r.action)).toEqual(["bed.update"]);
    expect(JSON.parse(rows[0]!.before_json!)).toMatchObject({ label: "1" });
    expect(JSON.parse(rows[0]!.after_json!)).toMatchObject({ label: "W1" });
  });

  it("refuses to retire a bed with a patient in it, naming the bed and the patient", async () => {
    const { admin, unit } = await newUnitWithAdmin({ initialBeds: 1 });
    const [bed] = await listBeds(appDb(), unit.id);
    const { mrn } = await admit(bed!.id);
    const error = await updateBedOperation
      .invoke(appDb(), admin, { unitId: unit.id, bedId: bed!.id, active: false })
      .catch((e: unknown) => e);
    expect(error).toBeInstanceOf(ConflictError);
    expect((error as ConflictError).status).toBe(409);
    expect((error as ConflictError).message).toContain("Bed 1");
    expect((error as ConflictError).message).toContain("O.B.");
    expect((error as ConflictError).message).toContain(mrn);
    expect((await listBeds(appDb(), unit.id))[0]!.active).toBe(true);
    expect(await ledgerRows("bed", bed!.id)).toEqual([]);
    const [overview] = await listUnitOverviews(appDb(), [unit.id]);
    expect(overview).toMatchObject({ beds: 1, occupiedBeds: 1 });
  });

  it("retires an empty bed and restores it, each with its ledger row", async () => {
    const { admin, unit } = await newUnitWithAdmin({ initialBeds: 2 });
    const [bed] = await listBeds(appDb(), unit.id);
    const retired = await updateBedOperation.invoke(appDb(), admin, {
      unitId: unit.id,
      bedId: bed!.id,
      active: false,
    });
    expect(retired.active).toBe(false);
    expect((await listBeds(appDb(), unit.id)).map((b) => b.label)).toEqual(["2"]);
    const restored = await updateBedOperation.invoke(appDb(), admin, {
      unitId: unit.id,
      bedId: bed!.id,
      active: true,
    });
    expect(restored.active).toBe(true);
    const rows = await ledgerRows("bed", bed!.id);
    expect(
      rows.map((r) => [r.action, (JSON.parse(r.after_json!) as { active: boolean }).active]),
    ).toEqual([
      ["bed.update", false],
      ["bed.update", true],
    ]);
    expect(rows.every((r) => r.unit_id === unit.id && r.patient_id === null)).toBe(true);
  });

  it("refuses an update that names neither a label nor active", async () => {
    const { admin, unit } = await newUnitWithAdmin({ initialBeds: 1 });
    const [bed] = await listBeds(appDb(), unit.id);
    await expect(
      updateBedOperation.invoke(appDb(), admin, { unitId: unit.id, bedId: bed!.id }),
    ).rejects.toBeInstanceOf(ValidationError);
  });
});

it("keeps every device code of lib/devices valid for a unit", async () => {
  const { unit } = await newUnitWithAdmin({ allowedDevices: [...DEVICES].reverse() });
  expect(unit.allowedDevices).toEqual([...DEVICES]);
});

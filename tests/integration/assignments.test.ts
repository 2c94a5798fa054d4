import { randomUUID } from "node:crypto";
import type { Knex } from "knex";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { ONLY_CHARGE_OR_ADMIN } from "@/lib/assignments/may-assign";
import { readAssignmentsOperation, setAssignmentsOperation } from "@/lib/assignments/operations";
import { myBeds } from "@/lib/assignments/queries";
import { rollAssignments } from "@/lib/assignments/roll";
import type { Actor } from "@/lib/auth/actor";
import { loadActor } from "@/lib/auth/actor-queries";
import { closeDb } from "@/lib/db";
import { ForbiddenError, NotFoundError, ValidationError } from "@/lib/errors";
import { nextShift, previousShift, shiftAt, type ShiftPattern } from "@/lib/units/shifts";
import { actorByEmail, appDb, SEEDED, uniqueEmail } from "../helpers/db";
import { scratchDb, type ScratchDb } from "../helpers/scratch-db";

afterAll(async () => {
  await closeDb();
});

const PATTERN: ShiftPattern = { timeZone: "UTC", shiftStart: "07:00", shiftHours: 12 };
const NOW = new Date();
const CURRENT = shiftAt(PATTERN, NOW);
const NEXT = nextShift(PATTERN, CURRENT);
const PREVIOUS = previousShift(PATTERN, CURRENT);

type Staff = { id: number; actor: Actor };
type TestUnit = {
  id: number;
  code: string;
  beds: number[];
  admin: Staff;
  charge: Staff;
  nurse: Staff;
  therapist: Staff;
  physician: Staff;
};

async function addUser(knex: Knex, role: string, unitIds: number[], name: string) {
  const [id] = await knex("users").insert({
    email: uniqueEmail(`assign-${role}`),
    name,
    role,
    password_hash: "not-used-in-these-tests",
  });
  await knex("user_units").insert(unitIds.map((unit_id) => ({ user_id: Number(id), unit_id })));
  return Number(id);
}

/** A unit of its own (12 h shifts from 07:00 UTC), three beds, one patient, its staff, a charge nurse now. */
async function freshUnit(knex: Knex = appDb()): Promise<TestUnit> {
  const code = `A${randomUUID().slice(0, 6)}`;
  const [unitId] = await knex("units").insert({
    code,
    name: `Assign ${code}`,
    kind: "icu",
    shift_start: "07:00",
    shift_hours: 12,
  });
  const id = Number(unitId);
  const beds: number[] = [];
  for (const [i, label] of ["B3", "B1", "B2"].entries()) {
    const [bedId] = await knex("beds").insert({ unit_id: id, label, sort_order: [3, 1, 2][i] });
    beds.push(Number(bedId));
  }
  beds.sort((a, b) => a - b);
  const ordered = [beds[1]!, beds[2]!, beds[0]!]; // B1, B2, B3 by sort order
  const [patientId] = await knex("patients").insert({
    mrn: `ASG${randomUUID().slice(0, 8)}`,
    family_name: "Quillfeather",
    given_name: "Mara",
    birth_date: "1958-03-02",
    sex: "female",
    height_cm: 168,
  });
  await knex("admissions").insert({
    patient_id: patientId,
    bed_id: ordered[0],
    admitted_at: new Date(Date.now() - 3600_000),
  });
  const staff = async (role: string, name: string): Promise<Staff> => {
    const userId = await addUser(knex, role, [id], name);
    return { id: userId, actor: await loadActor(knex, userId) };
  };
  const unit: TestUnit = {
    id,
    code,
    beds: ordered,
    admin: await staff("admin", "Admin Test"),
    charge: await staff("nurse", "Charge Test"),
    nurse: await staff("nurse", "Nurse Test"),
    therapist: await staff("therapist", "Therapist Test"),
    physician: await staff("physician", "Physician Test"),
  };
  await knex("unit_charge_duties").insert({
    unit_id: id,
    user_id: unit.charge.id,
    starts_at: CURRENT.startsAt,
    ends_at: CURRENT.endsAt,
  });
  return unit;
}

async function ledgerFor(unitId: number) {
  return (await appDb()("ledger_entries").where({ unit_id: unitId }).orderBy("id")) as {
    action: string;
    entity_type: string;
    entity_id: string;
    actor_role: string;
    actor_user_id: number | null;
    before_json: string | null;
    after_json: string | null;
    rationale: string | null;
  }[];
}

async function cells(unitId: number, startsAt: Date, knex: Knex = appDb()) {
  return (await knex("care_assignments as c")
    .join("beds as b", "b.id", "c.bed_id")
    .where({ "b.unit_id": unitId, "c.starts_at": startsAt })
    .orderBy(["b.sort_order", "c.duty"])
    .select("c.bed_id as bedId", "c.duty", "c.user_id as userId", "c.ends_at as endsAt")) as {
    bedId: number;
    duty: string;
    userId: number;
    endsAt: Date;
  }[];
}

async function chargeOf(unitId: number, startsAt: Date, knex: Knex = appDb()) {
  const row = (await knex("unit_charge_duties")
    .where({ unit_id: unitId, starts_at: startsAt })
    .first("user_id")) as { user_id: number } | undefined;
  return row?.user_id ?? null;
}

describe("reading a shift's grid", () => {
  let u: TestUnit;
  beforeAll(async () => {
    u = await freshUnit();
    await appDb()("care_assignments").insert({
      bed_id: u.beds[1],
      user_id: u.therapist.id,
      duty: "therapist",
      starts_at: CURRENT.startsAt,
      ends_at: CURRENT.endsAt,
    });
  });

  it("shows the active beds in order with initials, the cells, the charge nurse and the candidates", async () => {
    const grid = await readAssignmentsOperation.invoke(
      appDb(),
      u.nurse.actor,
      { unitId: u.id, shift: "current" },
      NOW,
    );
    expect(grid.shift).toMatchObject({
      startsAt: CURRENT.startsAt.toISOString(),
      endsAt: CURRENT.endsAt.toISOString(),
      place: "current",
    });
    expect(grid.beds.map((b) => b.label)).toEqual(["B1", "B2", "B3"]);
    expect(grid.beds[0]!.occupant).toMatchObject({ initials: "M.Q." });
    expect(grid.beds[1]!.occupant).toBeNull();
    expect(grid.beds[1]!.cells).toEqual({
      nurse: null,
      therapist: { userId: u.therapist.id, name: "Therapist Test" },
      physician: null,
    });
    expect(grid.charge).toEqual({ userId: u.charge.id, name: "Charge Test" });
    expect(grid.candidates.nurse.map((c) => c.id).sort()).toEqual([u.charge.id, u.nurse.id].sort());
    expect(grid.candidates.therapist).toEqual([{ id: u.therapist.id, name: "Therapist Test" }]);
    expect(grid.candidates.physician).toEqual([{ id: u.physician.id, name: "Physician Test" }]);
    // A plain nurse reads it but may not edit it, and is told why.
    expect(grid.editable).toBe(false);
    expect(grid.editWhy).toBe(ONLY_CHARGE_OR_ADMIN);
  });

  it("tells the charge nurse and the admin they may edit the current and next shift, not the previous", async () => {
    for (const actor of [u.charge.actor, u.admin.actor]) {
      for (const shift of ["current", "next"] as const) {
        const grid = await readAssignmentsOperation.invoke(
          appDb(),
          actor,
          { unitId: u.id, shift },
          NOW,
        );
        expect(grid.editable).toBe(true);
      }
      const past = await readAssignmentsOperation.invoke(
        appDb(),
        actor,
        { unitId: u.id, shift: "previous" },
        NOW,
      );
      expect(past.editable).toBe(false);
      expect(past.editWhy).toMatch(/past shifts are history/);
    }
  });

  it("answers 404 for another unit's grid and 400 naming the shift for a time that is no shift start", async () => {
    const outsider = await actorByEmail(SEEDED.physician);
    await expect(
      readAssignmentsOperation.invoke(appDb(), outsider, { unitId: u.id }, NOW),
    ).rejects.toBeInstanceOf(NotFoundError);
    const odd = new Date(CURRENT.startsAt.getTime() + 3600_000).toISOString();
    const error = (await readAssignmentsOperation
      .invoke(appDb(), u.nurse.actor, { unitId: u.id, shift: odd }, NOW)
      .catch((e: unknown) => e)) as ValidationError;
    expect(error).toBeInstanceOf(ValidationError);
    expect(error.fieldErrors?.shift?.[0]).toMatch(/not a shift start/);
    // An ISO start of one of the unit's shifts is read like "next".
    const byStart = await readAssignmentsOperation.invoke(
      appDb(),
      u.nurse.actor,
      { unitId: u.id, shift: NEXT.startsAt.toISOString() },
      NOW,
    );
    expect(byStart.shift.place).toBe("next");
  });
});

describe("writing a shift's assignments", () => {
  it("lets an admin set the next shift's cells and charge nurse, with one ledger row of the changed cells", async () => {
    const u = await freshUnit();
    const result = await setAssignmentsOperation.invoke(
      appDb(),
      u.admin.actor,
      {
        unitId: u.id,
        shift: "next",
        chargeNurseId: u.nurse.id,
        cells: [
          { bedId: u.beds[0], duty: "nurse", userId: u.nurse.id },
          { bedId: u.beds[0], duty: "physician", userId: u.physician.id },
          { bedId: u.beds[1], duty: "therapist", userId: null },
        ],
      },
      NOW,
    );
    expect(result.changed).toBe(3);
    expect(result.grid.beds[0]!.cells.nurse).toEqual({ userId: u.nurse.id, name: "Nurse Test" });
    const rows = await cells(u.id, NEXT.startsAt);
    expect(rows.map((r) => [r.bedId, r.duty, r.userId])).toEqual([
      [u.beds[0], "nurse", u.nurse.id],
      [u.beds[0], "physician", u.physician.id],
    ]);
    expect(new Date(rows[0]!.endsAt).toISOString()).toBe(NEXT.endsAt.toISOString());
    expect(await chargeOf(u.id, NEXT.startsAt)).toBe(u.nurse.id);

    const ledger = await ledgerFor(u.id);
    expect(ledger).toHaveLength(1);
    expect(ledger[0]).toMatchObject({
      action: "assignment.set",
      entity_type: "shift",
      entity_id: `${u.id}:${NEXT.startsAt.toISOString()}`,
      actor_user_id: u.admin.id,
    });
    expect(JSON.parse(ledger[0]!.before_json!)).toEqual({
      chargeNurseId: null,
      cells: [
        { bedId: u.beds[0], duty: "nurse", userId: null },
        { bedId: u.beds[0], duty: "physician", userId: null },
      ],
    });
    expect(JSON.parse(ledger[0]!.after_json!)).toMatchObject({
      chargeNurseId: u.nurse.id,
      cells: [
        { bedId: u.beds[0], duty: "nurse", userId: u.nurse.id },
        { bedId: u.beds[0], duty: "physician", userId: u.physician.id },
      ],
    });

    // The same grid again changes nothing and writes no second row; a swap changes one cell.
    const again = await setAssignmentsOperation.invoke(
      appDb(),
      u.admin.actor,
      {
        unitId: u.id,
        shift: "next",
        cells: [{ bedId: u.beds[0], duty: "nurse", userId: u.nurse.id }],
      },
      NOW,
    );
    expect(again.changed).toBe(0);
    await setAssignmentsOperation.invoke(
      appDb(),
      u.admin.actor,
      {
        unitId: u.id,
        shift: "next",
        cells: [{ bedId: u.beds[0], duty: "nurse", userId: u.charge.id }],
      },
      NOW,
    );
    const after = await ledgerFor(u.id);
    expect(after).toHaveLength(2);
    expect(JSON.parse(after[1]!.before_json!)).toEqual({
      cells: [{ bedId: u.beds[0], duty: "nurse", userId: u.nurse.id }],
    });
  });

  it("lets the current shift's charge nurse set the current shift and hand over the next; refuses another nurse", async () => {
    const u = await freshUnit();
    await setAssignmentsOperation.invoke(
      appDb(),
      u.charge.actor,
      {
        unitId: u.id,
        shift: "current",
        cells: [{ bedId: u.beds[2], duty: "nurse", userId: u.nurse.id }],
      },
      NOW,
    );
    await setAssignmentsOperation.invoke(
      appDb(),
      u.charge.actor,
      { unitId: u.id, shift: NEXT.startsAt.toISOString(), chargeNurseId: u.nurse.id, cells: [] },
      NOW,
    );
    expect((await cells(u.id, CURRENT.startsAt)).map((r) => r.userId)).toEqual([u.nurse.id]);
    expect(await chargeOf(u.id, NEXT.startsAt)).toBe(u.nurse.id);

    // The next shift's charge nurse is not the current one's: she may not assign yet.
    const refused = setAssignmentsOperation.invoke(
      appDb(),
      u.nurse.actor,
      {
        unitId: u.id,
        shift: "next",
        cells: [{ bedId: u.beds[1], duty: "nurse", userId: u.nurse.id }],
      },
      NOW,
    );
    await expect(refused).rejects.toBeInstanceOf(ForbiddenError);
    await expect(refused).rejects.toThrow(ONLY_CHARGE_OR_ADMIN);
    expect(await cells(u.id, NEXT.startsAt)).toEqual([]);
    expect(await ledgerFor(u.id)).toHaveLength(2);
  });

  it("refuses roles without the permission at the door, and another unit's admin with 404", async () => {
    const u = await freshUnit();
    const body = { unitId: u.id, shift: "next", cells: [] };
    await expect(
      setAssignmentsOperation.invoke(appDb(), u.physician.actor, body, NOW),
    ).rejects.toBeInstanceOf(ForbiddenError);
    await expect(
      setAssignmentsOperation.invoke(appDb(), u.therapist.actor, body, NOW),
    ).rejects.toBeInstanceOf(ForbiddenError);
    const other = await freshUnit();
    await expect(
      setAssignmentsOperation.invoke(appDb(), other.admin.actor, body, NOW),
    ).rejects.toBeInstanceOf(NotFoundError);
  });

  it("refuses a user of the wrong role, an inactive user, another unit's bed and a nurse as charge, naming each cell", async () => {
    const u = await freshUnit();
    const other = await freshUnit();
    const gone = await addUser(appDb(), "nurse", [u.id], "Gone Nurse");
    await appDb()("users").where({ id: gone }).update({ active: false });
    const error = (await setAssignmentsOperation
      .invoke(
        appDb(),
        u.admin.actor,
        {
          unitId: u.id,
          shift: "next",
          chargeNurseId: u.therapist.id,
          cells: [
            { bedId: u.beds[0], duty: "nurse", userId: u.nurse.id },
            { bedId: u.beds[0], duty: "therapist", userId: u.nurse.id },
            { bedId: other.beds[0], duty: "nurse", userId: u.nurse.id },
            { bedId: u.beds[1], duty: "nurse", userId: gone },
          ],
        },
        NOW,
      )
      .catch((e: unknown) => e)) as ValidationError;
    expect(error).toBeInstanceOf(ValidationError);
    expect(error.status).toBe(400);
    expect(Object.keys(error.fieldErrors ?? {}).sort()).toEqual([
      "cells.1.userId",
      "cells.2.bedId",
      "cells.3.userId",
      "chargeNurseId",
    ]);
    expect(error.fieldErrors!["cells.1.userId"]![0]).toBe(
      `B1 therapist: user ${u.nurse.id} is not an active therapist of ${u.code}.`,
    );
    // Nothing of the request was written, not even its valid first cell.
    expect(await cells(u.id, NEXT.startsAt)).toEqual([]);
    expect(await ledgerFor(u.id)).toHaveLength(0);
  });

  it("refuses past shifts as history, and shifts after the next", async () => {
    const u = await freshUnit();
    const cell = [{ bedId: u.beds[0], duty: "nurse", userId: u.nurse.id }];
    for (const shift of [PREVIOUS.startsAt, new Date(CURRENT.startsAt.getTime() - 86_400_000)]) {
      const error = (await setAssignmentsOperation
        .invoke(
          appDb(),
          u.admin.actor,
          { unitId: u.id, shift: shift.toISOString(), cells: cell },
          NOW,
        )
        .catch((e: unknown) => e)) as ValidationError;
      expect(error).toBeInstanceOf(ValidationError);
      expect(error.fieldErrors?.shift?.[0]).toMatch(/past shifts are history/);
      expect(await cells(u.id, shift)).toEqual([]);
    }
    const later = nextShift(PATTERN, NEXT).startsAt.toISOString();
    await expect(
      setAssignmentsOperation.invoke(
        appDb(),
        u.admin.actor,
        { unitId: u.id, shift: later, cells: cell },
        NOW,
      ),
    ).rejects.toThrow(/current and the next shift/);
    // "previous" is not a shift one can write at all.
    await expect(
      setAssignmentsOperation.invoke(
        appDb(),
        u.admin.actor,
        { unitId: u.id, shift: "previous", cells: cell },
        NOW,
      ),
    ).rejects.toBeInstanceOf(ValidationError);
  });

  it("copies the previous shift into the empty cells only, leaving out people no longer on the unit", async () => {
    const u = await freshUnit();
    const leaver = await addUser(appDb(), "nurse", [u.id], "Leaving Nurse");
    const row = (bed: number, duty: string, userId: number) => ({
      bed_id: bed,
      duty,
      user_id: userId,
      starts_at: CURRENT.startsAt,
      ends_at: CURRENT.endsAt,
    });
    await appDb()("care_assignments").insert([
      row(u.beds[0]!, "nurse", u.charge.id),
      row(u.beds[0]!, "therapist", u.therapist.id),
      row(u.beds[1]!, "nurse", leaver),
      row(u.beds[2]!, "physician", u.physician.id),
    ]);
    await appDb()("user_units").where({ user_id: leaver }).delete();
    // The next shift already has B1's nurse; the copy must keep it.
    await setAssignmentsOperation.invoke(
      appDb(),
      u.admin.actor,
      {
        unitId: u.id,
        shift: "next",
        cells: [{ bedId: u.beds[0], duty: "nurse", userId: u.nurse.id }],
      },
      NOW,
    );
    const result = await setAssignmentsOperation.invoke(
      appDb(),
      u.admin.actor,
      { unitId: u.id, shift: "next", copyFrom: "previous" },
      NOW,
    );
    expect(result.changed).toBe(3); // two cells and the charge duty
    expect((await cells(u.id, NEXT.startsAt)).map((r) => [r.bedId, r.duty, r.userId])).toEqual([
      [u.beds[0], "nurse", u.nurse.id],
      [u.beds[0], "therapist", u.therapist.id],
      [u.beds[2], "physician", u.physician.id],
    ]);
    // The charge duty came across too (the next shift had none).
    expect(await chargeOf(u.id, NEXT.startsAt)).toBe(u.charge.id);
    const ledger = await ledgerFor(u.id);
    expect(ledger).toHaveLength(2);
    expect(ledger[1]!.rationale).toMatch(/previous shift/);
  });

  it("replays an idempotent write once and keeps two concurrent writers' cells", async () => {
    const u = await freshUnit();
    const key = `assign-${randomUUID().slice(0, 8)}`;
    const body = {
      unitId: u.id,
      shift: "next",
      idempotencyKey: key,
      cells: [{ bedId: u.beds[0], duty: "nurse", userId: u.nurse.id }],
    };
    await setAssignmentsOperation.invoke(appDb(), u.admin.actor, body, NOW);
    await setAssignmentsOperation.invoke(appDb(), u.admin.actor, body, NOW);
    expect(await ledgerFor(u.id)).toHaveLength(1);

    await Promise.all([
      setAssignmentsOperation.invoke(
        appDb(),
        u.admin.actor,
        {
          unitId: u.id,
          shift: "next",
          cells: [{ bedId: u.beds[1], duty: "nurse", userId: u.charge.id }],
        },
        NOW,
      ),
      setAssignmentsOperation.invoke(
        appDb(),
        u.charge.actor,
        {
          unitId: u.id,
          shift: "next",
          cells: [{ bedId: u.beds[2], duty: "nurse", userId: u.nurse.id }],
        },
        NOW,
      ),
    ]);
    expect((await cells(u.id, NEXT.startsAt)).map((r) => r.bedId)).toEqual(u.beds);
    expect(await ledgerFor(u.id)).toHaveLength(3);
  });
});

describe("my beds", () => {
  it("lists the beds assigned to the user in the running shift, with the patient", async () => {
    const u = await freshUnit();
    await setAssignmentsOperation.invoke(
      appDb(),
      u.admin.actor,
      {
        unitId: u.id,
        shift: "current",
        cells: [
          { bedId: u.beds[0], duty: "nurse", userId: u.nurse.id },
          { bedId: u.beds[1], duty: "nurse", userId: u.nurse.id },
        ],
      },
      NOW,
    );
    await setAssignmentsOperation.invoke(
      appDb(),
      u.admin.actor,
      {
        unitId: u.id,
        shift: "next",
        cells: [{ bedId: u.beds[2], duty: "nurse", userId: u.nurse.id }],
      },
      NOW,
    );
    const mine = await myBeds(appDb(), u.nurse.actor, NOW);
    expect(mine.map((b) => [b.bedLabel, b.duty])).toEqual([
      ["B1", "nurse"],
      ["B2", "nurse"],
    ]);
    expect(mine[0]!.patient).toMatchObject({ name: "Quillfeather, Mara", initials: "M.Q." });
    expect(mine[1]!.patient).toBeNull();
    expect(await myBeds(appDb(), u.therapist.actor, NOW)).toEqual([]);
  });
});

describe("rolling assignments forward", () => {
  let scratch: ScratchDb;
  beforeAll(async () => {
    scratch = await scratchDb("assign_roll");
    await scratch.migrate();
  }, 120_000);
  afterAll(async () => {
    await scratch?.drop();
  });

  it("gives the current and next shift a copy of the same shift a day earlier, charge duty included, once", async () => {
    const knex = scratch.app;
    const u = await freshUnit(knex);
    // The last assignments end a day before now: yesterday's shift at this time and the one after it.
    const dayBefore = shiftAt(PATTERN, new Date(NOW.getTime() - 86_400_000));
    const dayBeforeNext = nextShift(PATTERN, dayBefore);
    await knex("unit_charge_duties").where({ unit_id: u.id }).delete();
    const put = async (shift: typeof dayBefore, nurse: number, charge: number) => {
      await knex("care_assignments").insert(
        u.beds.map((bed) => ({
          bed_id: bed,
          duty: "nurse",
          user_id: nurse,
          starts_at: shift.startsAt,
          ends_at: shift.endsAt,
        })),
      );
      await knex("unit_charge_duties").insert({
        unit_id: u.id,
        user_id: charge,
        starts_at: shift.startsAt,
        ends_at: shift.endsAt,
      });
    };
    await put(dayBefore, u.nurse.id, u.charge.id);
    await put(dayBeforeNext, u.charge.id, u.nurse.id);
    await knex("care_assignments").insert({
      bed_id: u.beds[0],
      duty: "physician",
      user_id: u.physician.id,
      starts_at: dayBefore.startsAt,
      ends_at: dayBefore.endsAt,
    });

    const rolled = await rollAssignments(knex, NOW);
    expect(rolled.map((r) => [r.startsAt, r.from])).toEqual([
      [CURRENT.startsAt.toISOString(), dayBefore.startsAt.toISOString()],
      [NEXT.startsAt.toISOString(), dayBeforeNext.startsAt.toISOString()],
    ]);
    const current = await cells(u.id, CURRENT.startsAt, knex);
    expect(current.map((r) => [r.bedId, r.duty, r.userId])).toEqual([
      [u.beds[0], "nurse", u.nurse.id],
      [u.beds[0], "physician", u.physician.id],
      [u.beds[1], "nurse", u.nurse.id],
      [u.beds[2], "nurse", u.nurse.id],
    ]);
    expect(new Date(current[0]!.endsAt).toISOString()).toBe(CURRENT.endsAt.toISOString());
    expect(await chargeOf(u.id, CURRENT.startsAt, knex)).toBe(u.charge.id);
    expect((await cells(u.id, NEXT.startsAt, knex)).map((r) => r.userId)).toEqual([
      u.charge.id,
      u.charge.id,
      u.charge.id,
    ]);
    expect(await chargeOf(u.id, NEXT.startsAt, knex)).toBe(u.nurse.id);

    const ledger = (await knex("ledger_entries").where({ unit_id: u.id }).orderBy("id")) as {
      action: string;
      entity_id: string;
      actor_role: string;
      actor_user_id: number | null;
      rationale: string;
    }[];
    expect(ledger).toEqual([
      expect.objectContaining({
        action: "assignment.set",
        entity_id: `${u.id}:${CURRENT.startsAt.toISOString()}`,
        actor_role: "system",
        actor_user_id: null,
        rationale: `Rolled forward from ${dayBefore.startsAt.toISOString()}`,
      }),
      expect.objectContaining({
        entity_id: `${u.id}:${NEXT.startsAt.toISOString()}`,
        rationale: `Rolled forward from ${dayBeforeNext.startsAt.toISOString()}`,
      }),
    ]);

    // A second run finds both shifts assigned and writes nothing.
    expect(await rollAssignments(knex, NOW)).toEqual([]);
    expect(await knex("ledger_entries").where({ unit_id: u.id }).count({ n: "*" })).toEqual([
      { n: 2 },
    ]);
    expect(await cells(u.id, CURRENT.startsAt, knex)).toHaveLength(4);
  });

  it("falls back to the latest shift with assignments when the day-earlier one has none", async () => {
    const knex = scratch.app;
    const u = await freshUnit(knex);
    await knex("unit_charge_duties").where({ unit_id: u.id }).delete();
    const old = shiftAt(PATTERN, new Date(NOW.getTime() - 3 * 86_400_000 - 12 * 3600_000));
    await knex("care_assignments").insert({
      bed_id: u.beds[1],
      duty: "therapist",
      user_id: u.therapist.id,
      starts_at: old.startsAt,
      ends_at: old.endsAt,
    });
    const rolled = (await rollAssignments(knex, NOW)).filter((r) => r.unitId === u.id);
    expect(rolled[0]).toMatchObject({
      startsAt: CURRENT.startsAt.toISOString(),
      from: old.startsAt.toISOString(),
    });
    expect((await cells(u.id, CURRENT.startsAt, knex)).map((r) => r.userId)).toEqual([
      u.therapist.id,
    ]);
    expect(await cells(u.id, NEXT.startsAt, knex)).toHaveLength(1);
  });
});

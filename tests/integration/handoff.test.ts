import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Actor } from "@/lib/auth/actor";
import { ageInYears } from "@/lib/admissions/display";
import { hashPassword } from "@/lib/auth/password";
import type { Role } from "@/lib/auth/roles";
import { loadActor } from "@/lib/auth/actor-queries";
import { closeDb } from "@/lib/db";
import { ForbiddenError, NotFoundError, ValidationError } from "@/lib/errors";
import { acknowledgeHandoffOperation, readHandoffOperation } from "@/lib/handoff/operations";
import { writeOrderOperation } from "@/lib/orders/operations";
import { chartReadingOperation } from "@/lib/readings/operations";
import { getUnit, type UnitDetail } from "@/lib/units/queries";
import { nextShift, shiftAt } from "@/lib/units/shifts";
import { actorByEmail, admitTestPatient, appDb, SEEDED, uniqueEmail } from "../helpers/db";
import { hfncOrder } from "../helpers/orders";

let physician: Actor;
let therapist: Actor;
let micu: UnitDetail;
let resp: UnitDetail;

let passwordHash: Promise<string> | undefined;
async function freshUser(role: Role, unitIds: number[]): Promise<Actor> {
  passwordHash ??= hashPassword("tidemark-demo");
  const [id] = await appDb()("users").insert({
    email: uniqueEmail(`handoff-${role}`),
    name: `Handoff ${role}`,
    role,
    password_hash: await passwordHash,
  });
  await appDb()("user_units").insert(unitIds.map((u) => ({ user_id: Number(id), unit_id: u })));
  return loadActor(appDb(), Number(id));
}

async function unitByCode(code: string): Promise<UnitDetail> {
  const { id } = (await appDb()("units").where({ code }).first("id")) as { id: number };
  return (await getUnit(appDb(), id))!;
}

beforeAll(async () => {
  [physician, therapist, micu, resp] = await Promise.all([
    actorByEmail(SEEDED.physician),
    actorByEmail(SEEDED.therapist),
    unitByCode("MICU"),
    unitByCode("RESP"),
  ]);
});

afterAll(async () => {
  await closeDb();
});

/** A fresh MICU patient with an order, a low reading (an open alert) and tonight's nurse assigned. */
async function patientWithHandoff(incomingNurse: Actor) {
  const admitted = await admitTestPatient("MICU");
  await writeOrderOperation.invoke(appDb(), physician, hfncOrder(admitted.patientId));
  const takenAt = new Date(Date.now() - 60_000);
  await chartReadingOperation.invoke(
    appDb(),
    therapist,
    {
      patientId: admitted.patientId,
      takenAt: takenAt.toISOString(),
      spo2: 88,
      device: "hfnc",
      fio2: 0.4,
      flow: 40,
    },
    takenAt,
  );
  const next = nextShift(micu, shiftAt(micu, new Date()));
  await appDb()("care_assignments").insert({
    bed_id: admitted.bedId,
    user_id: incomingNurse.id,
    duty: "nurse",
    starts_at: next.startsAt,
    ends_at: next.endsAt,
  });
  const admission = (await appDb()("admissions")
    .where({ patient_id: admitted.patientId })
    .first("id")) as { id: number };
  return { ...admitted, admissionId: admission.id, takenAt };
}

async function ledgerRows(admissionId: number) {
  return (await appDb()("ledger_entries")
    .where({
      action: "handoff.acknowledge",
      entity_type: "admission",
      entity_id: String(admissionId),
    })
    .select("patient_id", "unit_id", "actor_user_id", "after_json")) as {
    patient_id: number;
    unit_id: number;
    actor_user_id: number;
    after_json: string;
  }[];
}

describe("the handoff of a unit", () => {
  it("lists an occupied bed with its order, latest values, open alert, team and time in band", async () => {
    const nurse = await freshUser("nurse", [micu.id]);
    const p = await patientWithHandoff(nurse);
    const view = await readHandoffOperation.invoke(appDb(), nurse, { unitId: micu.id });

    const current = shiftAt(micu, new Date());
    expect(view.outgoing.startsAt).toBe(current.startsAt.toISOString());
    expect(view.incoming.startsAt).toBe(current.endsAt.toISOString());
    const bed = view.beds.find((b) => b.bedId === p.bedId)!;
    expect(bed).toBeDefined();
    expect(bed.patient.id).toBe(p.patientId);
    expect(bed.patient.mrn).toMatch(/^TST/);
    expect(bed.patient.age).toBe(ageInYears(new Date("1961-05-20"), new Date()));
    expect(bed.order).toMatchObject({
      device: "hfnc",
      spo2Band: { lower: 92, upper: 96 },
      limits: { fio2Min: 0.3, fio2Max: 0.6, flowMin: 30, flowMax: 60 },
    });
    expect(bed.settings).toMatchObject({ device: "hfnc", fio2: 0.4, flow: 40 });
    expect(bed.latestReading).toMatchObject({ spo2: 88, takenAt: p.takenAt.toISOString() });
    expect(bed.openAlerts.map((a) => a.kind)).toContain("below_band");
    expect(bed.incomingTeam.nurse).toEqual({ id: nurse.id, name: nurse.name });
    expect(bed.incomingNurseAcknowledged).toBe(false);
    // The last minute of the shift was spent below the band.
    expect(bed.timeInBand.below).toBeGreaterThan(0);
    expect(bed.timeInBand.from).toBe(current.startsAt.toISOString());
    // Only occupied beds.
    expect(view.beds.every((b) => b.patient.mrn.length > 0)).toBe(true);
  });

  it("answers 404 for a unit the reader is not on", async () => {
    const nurse = await freshUser("nurse", [resp.id]);
    await expect(readHandoffOperation.invoke(appDb(), nurse, { unitId: micu.id })).rejects.toThrow(
      NotFoundError,
    );
  });

  it("refuses a time that is not a shift start, and a shift long past", async () => {
    const nurse = await freshUser("nurse", [micu.id]);
    const next = nextShift(micu, shiftAt(micu, new Date()));
    const odd = new Date(next.startsAt.getTime() + 17 * 60_000).toISOString();
    await expect(
      readHandoffOperation.invoke(appDb(), nurse, { unitId: micu.id, shift: odd }),
    ).rejects.toThrow(/not the start of a shift/);
    const later = nextShift(micu, next).startsAt.toISOString();
    await expect(
      acknowledgeHandoffOperation.invoke(appDb(), nurse, {
        unitId: micu.id,
        shift: later,
        admissionIds: [1],
      }),
    ).rejects.toThrow(ValidationError);
  });
});

describe("acknowledging a handoff", () => {
  it("writes one acknowledgement with one ledger row, and a second one changes nothing", async () => {
    const nurse = await freshUser("nurse", [micu.id]);
    const p = await patientWithHandoff(nurse);
    const first = await acknowledgeHandoffOperation.invoke(appDb(), nurse, {
      unitId: micu.id,
      admissionIds: [p.admissionId],
    });
    const next = nextShift(micu, shiftAt(micu, new Date()));
    expect(first.shiftStartsAt).toBe(next.startsAt.toISOString());
    expect(first.beds).toEqual([
      expect.objectContaining({ admissionId: p.admissionId, alreadyAcknowledged: false }),
    ]);
    const rows = await ledgerRows(p.admissionId);
    expect(rows).toHaveLength(1);
    expect(rows[0]).toMatchObject({
      patient_id: p.patientId,
      unit_id: micu.id,
      actor_user_id: nurse.id,
    });
    expect(JSON.parse(rows[0]!.after_json)).toEqual({
      shiftStartsAt: next.startsAt.toISOString(),
      bed: ((await appDb()("beds").where({ id: p.bedId }).first("label")) as { label: string })
        .label,
    });

    // The same bed again, by ISO start this time: the first acknowledgement, nothing written.
    const second = await acknowledgeHandoffOperation.invoke(appDb(), nurse, {
      unitId: micu.id,
      shift: next.startsAt.toISOString(),
      admissionIds: [p.admissionId],
    });
    expect(second.beds[0]).toMatchObject({
      alreadyAcknowledged: true,
      acknowledgedAt: first.beds[0]!.acknowledgedAt,
    });
    expect(await ledgerRows(p.admissionId)).toHaveLength(1);
    expect(
      await appDb()("handoff_acknowledgements")
        .where({ admission_id: p.admissionId })
        .count({ n: "*" }),
    ).toEqual([{ n: 1 }]);

    const view = await readHandoffOperation.invoke(appDb(), nurse, { unitId: micu.id });
    const bed = view.beds.find((b) => b.admissionId === p.admissionId)!;
    expect(bed.incomingNurseAcknowledged).toBe(true);
    expect(bed.acknowledgements).toEqual([
      { userId: nurse.id, name: nurse.name, acknowledgedAt: first.beds[0]!.acknowledgedAt },
    ]);
  });

  it("accepts the current shift during its first hour only", async () => {
    const nurse = await freshUser("nurse", [micu.id]);
    const p = await patientWithHandoff(nurse);
    const current = shiftAt(micu, new Date());
    const input = {
      unitId: micu.id,
      shift: current.startsAt.toISOString(),
      admissionIds: [p.admissionId],
    };
    const early = new Date(current.startsAt.getTime() + 5 * 60_000);
    const done = await acknowledgeHandoffOperation.invoke(appDb(), nurse, input, early);
    expect(done.shiftStartsAt).toBe(current.startsAt.toISOString());
    const late = new Date(current.startsAt.getTime() + 61 * 60_000);
    await expect(acknowledgeHandoffOperation.invoke(appDb(), nurse, input, late)).rejects.toThrow(
      /Only the handover to the next shift/,
    );
  });

  it("refuses a therapist, answers 404 to a nurse of another unit and for a bed elsewhere", async () => {
    const nurse = await freshUser("nurse", [micu.id]);
    const p = await patientWithHandoff(nurse);
    const input = { unitId: micu.id, admissionIds: [p.admissionId] };
    await expect(acknowledgeHandoffOperation.invoke(appDb(), therapist, input)).rejects.toThrow(
      ForbiddenError,
    );
    const elsewhere = await freshUser("nurse", [resp.id]);
    await expect(acknowledgeHandoffOperation.invoke(appDb(), elsewhere, input)).rejects.toThrow(
      NotFoundError,
    );
    const respNurse = await freshUser("nurse", [resp.id, micu.id]);
    await expect(
      acknowledgeHandoffOperation.invoke(appDb(), respNurse, {
        unitId: resp.id,
        admissionIds: [p.admissionId],
      }),
    ).rejects.toThrow(NotFoundError);
    expect(await ledgerRows(p.admissionId)).toHaveLength(0);
  });
});

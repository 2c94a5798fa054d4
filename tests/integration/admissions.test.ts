import { randomUUID } from "node:crypto";
import type { Knex } from "knex";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import {
  admitOperation,
  dischargeOperation,
  searchPatientsOperation,
  transferOperation,
} from "@/lib/admissions/operations";
import { getPatientForActor } from "@/lib/admissions/queries";
import { DEFAULT_DETECTION } from "@/lib/alerts/detect";
import type { AlertConfig } from "@/lib/alerts/config";
import { listAlerts } from "@/lib/alerts/queries";
import { deliverOutbox } from "@/lib/alerts/outbox";
import { runAlertWork } from "@/lib/alerts/worker";
import type { Actor } from "@/lib/auth/actor";
import { loadActor } from "@/lib/auth/actor-queries";
import { hashPassword } from "@/lib/auth/password";
import { closeDb } from "@/lib/db";
import { ConflictError, ForbiddenError, NotFoundError } from "@/lib/errors";
import { startFakeInbox, type FakeInbox } from "@/lib/mail/fake-inbox";
import { createMailTransport } from "@/lib/mail/transport";
import { writeOrderOperation } from "@/lib/orders/operations";
import { chartReadingOperation } from "@/lib/readings/operations";
import { nextShift, shiftAt } from "@/lib/units/shifts";
import { appDb } from "../helpers/db";
import { hfncOrder } from "../helpers/orders";

// Admit, transfer and discharge on two units of their own (a fresh ICU and a
// ward that does not allow high flow), with fresh staff, so the recipients of
// every alert are exactly the ones each test assigns: the assigned nurse, the
// charge nurse, the unit's fallback address. Real MariaDB, the worker with an
// injected clock, nodemailer to the local SMTP fake.

const cfg: AlertConfig = {
  ...DEFAULT_DETECTION,
  escalateAfterMs: 10 * 60_000,
  limitsSettleMs: 5 * 60_000,
};
const PATTERN = { timeZone: "UTC", shiftStart: "07:00", shiftHours: 12 } as const;
const tag = randomUUID().slice(0, 6).toUpperCase();

let inbox: FakeInbox;
let knex: Knex;
const staff: Record<string, Actor> = {};
let icu: { id: number; beds: number[]; fallback: string };
let ward: { id: number; beds: number[] };

const sender = () => createMailTransport({ host: "127.0.0.1", port: inbox.smtpPort });

async function makeUnit(code: string, devices: string[], fallback: string | null) {
  const [id] = await knex("units").insert({
    code,
    name: `Test ${code}`,
    kind: "icu",
    altitude_m: 0,
    time_zone: "UTC",
    shift_start: PATTERN.shiftStart,
    shift_hours: PATTERN.shiftHours,
    devices_json: JSON.stringify(devices),
    fallback_email: fallback,
  });
  const beds: number[] = [];
  for (let n = 1; n <= 30; n++) {
    const [bed] = await knex("beds").insert({
      unit_id: id,
      label: `${code.slice(0, 3)}${n}`,
      sort_order: n,
    });
    beds.push(Number(bed));
  }
  return { id: Number(id), beds };
}

beforeAll(async () => {
  knex = appDb();
  inbox = await startFakeInbox({ smtpPort: 0, httpPort: null });
  const allDevices = ["room_air", "nasal_cannula", "venturi_mask", "hfnc", "niv", "invasive"];
  const fallback = `desk-${tag.toLowerCase()}@test.kestrel.example`;
  icu = { ...(await makeUnit(`AI${tag}`, allDevices, fallback)), fallback };
  ward = await makeUnit(`AW${tag}`, ["room_air", "nasal_cannula", "venturi_mask"], null);
  const hash = await hashPassword("tidemark-demo");
  const people = [
    ["physician", "physician"],
    ["therapist", "therapist"],
    ["nurse1", "nurse"],
    ["nurse2", "nurse"],
    ["nurse3", "nurse"],
    ["charge", "nurse"],
    ["colleague", "nurse"],
  ] as const;
  for (const [key, role] of people) {
    const [id] = await knex("users").insert({
      email: `${key}-${tag.toLowerCase()}@test.kestrel.example`,
      name: `${key[0]!.toUpperCase()}${key.slice(1)} ${tag}`,
      role,
      password_hash: hash,
    });
    await knex("user_units").insert([
      { user_id: id, unit_id: icu.id },
      { user_id: id, unit_id: ward.id },
    ]);
    staff[key] = await loadActor(knex, Number(id));
  }
});

afterAll(async () => {
  await inbox.stop();
  await closeDb();
});

/** A bed no test has used yet: each test starts from empty beds. */
function nextBed(unit: { beds: number[] }): number {
  const bed = unit.beds.shift();
  if (bed === undefined) throw new Error("The test unit ran out of beds; add more in makeUnit.");
  return bed;
}

let mrnSeq = 0;
function newPatient(overrides: Record<string, unknown> = {}) {
  mrnSeq += 1;
  return {
    mrn: `AD${tag}${mrnSeq}`,
    familyName: "Quellmoor",
    givenName: `Ada${mrnSeq}`,
    birthDate: "1958-04-11",
    sex: "female",
    heightCm: 162,
    ...overrides,
  };
}

async function assign(bedId: number, user: Actor, shift: { startsAt: Date; endsAt: Date }) {
  await knex("care_assignments").insert({
    bed_id: bedId,
    user_id: user.id,
    duty: "nurse",
    starts_at: shift.startsAt,
    ends_at: shift.endsAt,
  });
}

/** Admitted by a nurse, with a signed high-flow order in effect (SpO2 band 92–96 %). */
async function admittedWithOrder(bedId: number, now = new Date()) {
  const admission = await admitOperation.invoke(
    knex,
    staff.nurse1!,
    { ...newPatient(), bedId, rationale: "From the emergency department" },
    now,
  );
  await writeOrderOperation.invoke(knex, staff.physician!, hfncOrder(admission.patientId), now);
  return admission;
}

async function chartLow(patientId: number, at: Date, spo2 = 86) {
  await chartReadingOperation.invoke(
    knex,
    staff.colleague!,
    { patientId, takenAt: at.toISOString(), spo2, device: "hfnc", fio2: 0.4, flow: 40 },
    at,
  );
  const [alert] = await listAlerts(knex, staff.colleague!, { patientId, status: "open" });
  return alert!;
}

const mailsTo = (alertId: number) =>
  inbox
    .messages()
    .filter((m) => m.headers["x-tidemark-alert"] === String(alertId))
    .map((m) => m.to[0]);

describe("an alert always reaches someone", () => {
  it("admit → order → low SpO2 → the nurse assigned for that shift; at shift change, the next shift's nurse", async () => {
    const now = new Date();
    const bedId = nextBed(icu);
    const current = shiftAt(PATTERN, now);
    const next = nextShift(PATTERN, current);
    await assign(bedId, staff.nurse1!, current);
    await assign(bedId, staff.nurse2!, next);
    const { patientId } = await admittedWithOrder(bedId, now);

    const first = await chartLow(patientId, now);
    await runAlertWork(knex, sender(), new Date(now.getTime() + 1000), cfg);
    expect(mailsTo(first.id)).toEqual([staff.nurse1!.email]);
    expect(first.detail.told).toEqual({
      level: 0,
      recipients: [{ name: staff.nurse1!.name, basis: "assigned" }],
    });

    // Back in band, then low again one minute into the next shift.
    const later = new Date(next.startsAt.getTime() + 60_000);
    await chartReadingOperation.invoke(
      knex,
      staff.colleague!,
      { patientId, takenAt: later.toISOString(), spo2: 94, device: "hfnc", fio2: 0.4, flow: 40 },
      later,
    );
    const lower = new Date(later.getTime() + 60_000);
    const second = await chartLow(patientId, lower);
    expect(second.id).not.toBe(first.id);
    // Delivery only: a whole worker pass half a day ahead would run the sweeps on every seeded patient.
    await deliverOutbox(knex, sender(), new Date(lower.getTime() + 1000));
    expect(mailsTo(second.id)).toEqual([staff.nurse2!.email]);
  });

  it("with no nurse assigned, tells the unit's charge nurse of the shift, and says why", async () => {
    const now = new Date();
    const bedId = nextBed(icu);
    const shift = shiftAt(PATTERN, now);
    await knex("unit_charge_duties").insert({
      unit_id: icu.id,
      user_id: staff.charge!.id,
      starts_at: shift.startsAt,
      ends_at: shift.endsAt,
    });
    try {
      const { patientId } = await admittedWithOrder(bedId, now);
      const alert = await chartLow(patientId, now);
      await runAlertWork(knex, sender(), new Date(now.getTime() + 1000), cfg);
      expect(mailsTo(alert.id)).toEqual([staff.charge!.email]);
      expect(alert.detail).toMatchObject({
        unassignedLevel: null,
        told: { level: 0, recipients: [{ name: staff.charge!.name, basis: "charge" }] },
      });
      const row = (await knex("mail_outbox").where({ alert_id: alert.id }).first()) as {
        recipient_basis: string;
      };
      expect(row.recipient_basis).toBe("charge");
    } finally {
      await knex("unit_charge_duties").where({ unit_id: icu.id }).delete();
    }
  });

  it("with neither, e-mails the unit's fallback address", async () => {
    const now = new Date();
    const { patientId } = await admittedWithOrder(nextBed(icu), now);
    const alert = await chartLow(patientId, now);
    await runAlertWork(knex, sender(), new Date(now.getTime() + 1000), cfg);
    expect(mailsTo(alert.id)).toEqual([icu.fallback]);
    const row = (await knex("mail_outbox").where({ alert_id: alert.id }).first()) as {
      recipient_user_id: number | null;
      recipient_basis: string;
      state: string;
    };
    expect(row).toMatchObject({
      recipient_user_id: null,
      recipient_basis: "fallback",
      state: "sent",
    });
    // The delivery is a ledger row like any other.
    const notify = await knex("ledger_entries")
      .where({ entity_type: "alert", entity_id: String(alert.id), action: "alert.notify" })
      .count({ n: "*" });
    expect(Number(notify[0]!.n)).toBe(1);
  });

  it("says nobody could be told when the unit has no assignment, no charge nurse and no fallback", async () => {
    const now = new Date();
    const bedId = nextBed(ward);
    const admission = await admitOperation.invoke(
      knex,
      staff.nurse1!,
      { ...newPatient(), bedId },
      now,
    );
    await writeOrderOperation.invoke(
      knex,
      staff.physician!,
      hfncOrder(admission.patientId, {
        device: "venturi_mask",
        fio2Min: 0.28,
        fio2Max: 0.6,
        initialFio2: 0.35,
        flowMin: undefined,
        flowMax: undefined,
        initialFlow: undefined,
      }),
      now,
    );
    await chartReadingOperation.invoke(
      knex,
      staff.colleague!,
      {
        patientId: admission.patientId,
        takenAt: now.toISOString(),
        spo2: 86,
        device: "venturi_mask",
        fio2: 0.35,
      },
      now,
    );
    const [alert] = await listAlerts(knex, staff.colleague!, {
      patientId: admission.patientId,
      status: "open",
    });
    expect(alert!.detail).toMatchObject({ unassignedLevel: 0, told: { level: 0, recipients: [] } });
  });
});

describe("transfer", () => {
  it("moves the open alert to the new bed and tells that bed's nurse; the ledger names both beds", async () => {
    const now = new Date();
    const shift = shiftAt(PATTERN, now);
    const [from, to] = [nextBed(icu), nextBed(icu)];
    await assign(from, staff.nurse1!, shift);
    await assign(to, staff.nurse3!, shift);
    const admission = await admittedWithOrder(from, now);
    const alert = await chartLow(admission.patientId, now);

    const moved = await transferOperation.invoke(
      knex,
      staff.nurse1!,
      { admissionId: admission.admissionId, bedId: to, rationale: "Closer to the station" },
      now,
    );
    expect(moved).toMatchObject({ admissionId: admission.admissionId, bed: { id: to } });
    const stored = (await knex("alerts").where({ id: alert.id }).first("bed_id")) as {
      bed_id: number;
    };
    expect(stored.bed_id).toBe(to);
    await runAlertWork(knex, sender(), new Date(now.getTime() + 1000), cfg);
    expect(mailsTo(alert.id).sort()).toEqual([staff.nurse1!.email, staff.nurse3!.email].sort());
    const entry = (await knex("ledger_entries")
      .where({ action: "patient.transfer", entity_id: String(admission.admissionId) })
      .first("before_json", "after_json", "rationale")) as {
      before_json: string;
      after_json: string;
      rationale: string;
    };
    expect((JSON.parse(entry.before_json) as { bed: { id: number } }).bed.id).toBe(from);
    expect(JSON.parse(entry.after_json)).toMatchObject({ bed: { id: to }, alertsMoved: 1 });
    expect(entry.rationale).toBe("Closer to the station");
  });

  it("refuses a unit that does not allow the device in use, naming it", async () => {
    const admission = await admittedWithOrder(nextBed(icu));
    const refusal = transferOperation.invoke(knex, staff.nurse1!, {
      admissionId: admission.admissionId,
      bedId: nextBed(ward),
      rationale: "Step down",
    });
    await expect(refusal).rejects.toBeInstanceOf(ConflictError);
    await expect(refusal).rejects.toThrow(/does not allow High-flow/);
  });

  it("two moves into one bed: one wins, the other is told the bed is taken", async () => {
    const target = nextBed(icu);
    const [a, b] = await Promise.all([
      admittedWithOrder(nextBed(icu)),
      admittedWithOrder(nextBed(icu)),
    ]);
    const results = await Promise.allSettled(
      [a, b].map((x) =>
        transferOperation.invoke(knex, staff.nurse1!, {
          admissionId: x.admissionId,
          bedId: target,
          rationale: "Race",
        }),
      ),
    );
    expect(results.filter((r) => r.status === "fulfilled")).toHaveLength(1);
    const lost = results.find((r) => r.status === "rejected") as PromiseRejectedResult;
    expect(lost.reason).toBeInstanceOf(ConflictError);
    expect((lost.reason as Error).message).toMatch(/^Bed \S+ is no longer free/);
  });
});

describe("admit", () => {
  it("two admissions into one bed at once: one 201, one 409 naming the bed", async () => {
    const bedId = nextBed(ward);
    const results = await Promise.allSettled(
      [newPatient(), newPatient()].map((patient) =>
        admitOperation.invoke(knex, staff.nurse1!, { ...patient, bedId }),
      ),
    );
    expect(results.filter((r) => r.status === "fulfilled")).toHaveLength(1);
    const lost = results.find((r) => r.status === "rejected") as PromiseRejectedResult;
    expect(lost.reason).toBeInstanceOf(ConflictError);
    const label = (await knex("beds").where({ id: bedId }).first("label")) as { label: string };
    expect((lost.reason as Error).message).toContain(`Bed ${label.label}`);
  });

  it("finds a returning patient by MRN instead of duplicating, and refuses a mismatched one", async () => {
    const patient = newPatient();
    const first = await admitOperation.invoke(knex, staff.nurse1!, {
      ...patient,
      bedId: nextBed(ward),
    });
    await dischargeOperation.invoke(knex, staff.nurse1!, {
      admissionId: first.admissionId,
      disposition: "home",
    });
    const again = await admitOperation.invoke(knex, staff.nurse1!, {
      ...patient,
      weightKg: 71,
      bedId: nextBed(ward),
    });
    expect(again).toMatchObject({ patientId: first.patientId, returning: true });
    expect(await knex("patients").where({ mrn: patient.mrn }).count({ n: "*" })).toEqual([
      { n: 1 },
    ]);
    await expect(
      admitOperation.invoke(knex, staff.nurse1!, {
        ...patient,
        givenName: "Someone",
        bedId: nextBed(ward),
      }),
    ).rejects.toThrow(/belongs to Quellmoor/);
  });

  it("is for physicians, nurses and admins of the unit: a therapist is refused, another unit is not found", async () => {
    await expect(
      admitOperation.invoke(knex, staff.therapist!, {
        ...newPatient(),
        bedId: nextBed(ward),
      }),
    ).rejects.toBeInstanceOf(ForbiddenError);
    const micuBed = (await knex("beds as b")
      .join("units as u", "u.id", "b.unit_id")
      .where("u.code", "MICU")
      .first("b.id")) as { id: number };
    await expect(
      admitOperation.invoke(knex, staff.nurse1!, { ...newPatient(), bedId: micuBed.id }),
    ).rejects.toBeInstanceOf(NotFoundError);
  });

  it("refuses an admission time in the future, naming the field", async () => {
    await expect(
      admitOperation.invoke(knex, staff.nurse1!, {
        ...newPatient(),
        bedId: nextBed(ward),
        admittedAt: new Date(Date.now() + 3600_000).toISOString(),
      }),
    ).rejects.toMatchObject({
      fieldErrors: { admittedAt: [expect.stringMatching(/not in the future/)] },
    });
  });
});

describe("discharge", () => {
  it("discontinues the order with the reason, resolves open alerts, frees the bed, keeps the records readable", async () => {
    const bedId = nextBed(icu);
    const admission = await admittedWithOrder(bedId);
    const alert = await chartLow(admission.patientId, new Date());
    const out = await dischargeOperation.invoke(knex, staff.physician!, {
      admissionId: admission.admissionId,
      disposition: "other_hospital",
      rationale: "ECMO centre",
    });
    expect(out.disposition).toBe("other_hospital");
    expect(typeof out.dischargedAt).toBe("string");
    const order = (await knex("orders")
      .where({ admission_id: admission.admissionId })
      .first("status", "discontinue_reason")) as { status: string; discontinue_reason: string };
    expect(order).toEqual({
      status: "discontinued",
      discontinue_reason: "Discharged: another hospital (ECMO centre)",
    });
    const resolved = (await knex("alerts").where({ id: alert.id }).first("state")) as {
      state: string;
    };
    expect(resolved.state).toBe("resolved");
    // The bed takes the next patient.
    await admitOperation.invoke(knex, staff.nurse1!, { ...newPatient(), bedId });
    // The discharged patient's Chart still opens, as discharged.
    const chart = await getPatientForActor(knex, staff.physician!, admission.patientId);
    expect(chart.admission.dischargedAt).not.toBeNull();
    const actions = (await knex("ledger_entries")
      .where({ patient_id: admission.patientId })
      .orderBy("chain_seq")
      .pluck("action")) as string[];
    expect(actions.slice(-3)).toEqual(["order.discontinue", "alert.resolve", "patient.discharge"]);
  });
});

describe("patient search", () => {
  it("finds by MRN prefix, by name and by bed, only on the user's units", async () => {
    const admission = await admitOperation.invoke(knex, staff.nurse1!, {
      ...newPatient({ familyName: "Zephyrine" }),
      bedId: nextBed(ward),
    });
    const byMrn = await searchPatientsOperation.invoke(knex, staff.nurse1!, {
      query: admission.mrn.slice(0, 6),
    });
    expect(byMrn.map((h) => h.patientId)).toContain(admission.patientId);
    const byName = await searchPatientsOperation.invoke(knex, staff.nurse1!, { query: "zephyr" });
    expect(byName.map((h) => h.patientId)).toEqual([admission.patientId]);
    const byBed = await searchPatientsOperation.invoke(knex, staff.nurse1!, {
      query: admission.bed.label,
    });
    expect(byBed.map((h) => h.patientId)).toContain(admission.patientId);
    const seededNurse = await loadActor(
      knex,
      (
        (await knex("users").where({ email: "hana.whitlock@kestrel.example" }).first("id")) as {
          id: number;
        }
      ).id,
    );
    expect(await searchPatientsOperation.invoke(knex, seededNurse, { query: "zephyr" })).toEqual(
      [],
    );
  });
});

describe("a unit's devices", () => {
  it("refuses an order for a device the unit does not allow, naming the unit and the device", async () => {
    const admission = await admitOperation.invoke(knex, staff.nurse1!, {
      ...newPatient(),
      bedId: nextBed(ward),
    });
    await expect(
      writeOrderOperation.invoke(knex, staff.physician!, hfncOrder(admission.patientId)),
    ).rejects.toMatchObject({
      fieldErrors: { device: [expect.stringMatching(/does not allow High-flow nasal cannula/)] },
    });
  });
});

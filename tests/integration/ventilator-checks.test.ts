import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { recordHeightOperation } from "@/lib/admissions/operations";
import type { AlertConfig } from "@/lib/alerts/config";
import { DEFAULT_DETECTION } from "@/lib/alerts/detect";
import { listAlerts } from "@/lib/alerts/queries";
import { runAlertWork } from "@/lib/alerts/worker";
import type { Actor } from "@/lib/auth/actor";
import { closeDb } from "@/lib/db";
import { startFakeInbox, type FakeInbox } from "@/lib/mail/fake-inbox";
import { createMailTransport } from "@/lib/mail/transport";
import { writeOrderOperation } from "@/lib/orders/operations";
import type { OrderView } from "@/lib/orders/queries";
import {
  readVentilatorChecksOperation,
  recordVentilatorCheckOperation,
} from "@/lib/ventilator-checks/operations";
import type { VentilatorCheckInput } from "@/lib/ventilator-checks/schema";
import type * as LungProtection from "@/lib/alerts/lung-protection";
import { SEEDED, actorByEmail, admitTestPatient, appDb } from "../helpers/db";
import { hfncOrder, ventilatorOrder } from "../helpers/orders";

// A check recorded through the operation writes the check, its ledger row and
// the lung-protection alert with its outbox rows in one transaction; the worker
// (an injected clock, never a sleep) sends through nodemailer to the SMTP fake.

// Lets one test make the alert step fail inside the check's transaction.
const failAlert = vi.hoisted(() => ({ next: false }));
vi.mock("@/lib/alerts/lung-protection", async (original) => {
  const real = await original<typeof LungProtection>();
  return {
    ...real,
    afterVentilatorCheckRecorded: async (
      ...args: Parameters<typeof real.afterVentilatorCheckRecorded>
    ) => {
      if (failAlert.next) {
        failAlert.next = false;
        throw new Error("alert step failed (test)");
      }
      return real.afterVentilatorCheckRecorded(...args);
    },
  };
});

const cfg: AlertConfig = {
  ...DEFAULT_DETECTION,
  escalateAfterMs: 10 * 60_000,
  limitsSettleMs: 5 * 60_000,
};
const MIN = 60_000;
/** A therapist of the medical ICU who is not assigned to the test beds: records the checks. */
const RECORDER = "priya.castellan@kestrel.example";

let inbox: FakeInbox;
let nurse: Actor;
let therapist: Actor;
let physician: Actor;
let recorder: Actor;
const sender = () => createMailTransport({ host: "127.0.0.1", port: inbox.smtpPort });

beforeAll(async () => {
  inbox = await startFakeInbox({ smtpPort: 0, httpPort: null });
  [nurse, therapist, physician, recorder] = await Promise.all([
    actorByEmail(SEEDED.nurse),
    actorByEmail(SEEDED.therapist),
    actorByEmail(SEEDED.physician),
    actorByEmail(RECORDER),
  ]);
});

afterAll(async () => {
  await inbox.stop();
  await closeDb();
});

/** A fresh MICU patient (female, 165 cm) with this shift's team and a ventilator order. */
async function ventilatedPatient() {
  const admitted = await admitTestPatient("MICU");
  const now = Date.now();
  await appDb()("care_assignments").insert(
    (
      [
        ["nurse", nurse],
        ["therapist", therapist],
        ["physician", physician],
      ] as const
    ).map(([duty, user]) => ({
      bed_id: admitted.bedId,
      user_id: user.id,
      duty,
      starts_at: new Date(now - 2 * 3600_000),
      ends_at: new Date(now + 12 * 3600_000),
    })),
  );
  const order = (await writeOrderOperation.invoke(
    appDb(),
    physician,
    ventilatorOrder(admitted.patientId),
  )) as OrderView;
  return { ...admitted, order };
}

function check(patientId: number, at: Date, over: Partial<VentilatorCheckInput> = {}) {
  return recordVentilatorCheckOperation.invoke(
    appDb(),
    recorder,
    {
      patientId,
      checkedAt: at.toISOString(),
      setVt: 340,
      measuredVt: 340,
      setRate: 22,
      measuredRate: 22,
      minuteVentilation: 7.5,
      peak: 31,
      plateau: 24,
      totalPeep: 10,
      ...over,
    },
    at,
  );
}

const mailsFor = (alertId: number) =>
  inbox.messages().filter((m) => m.headers["x-tidemark-alert"] === String(alertId));

async function lungAlerts(patientId: number, status: "open" | "all" = "open") {
  return (await listAlerts(appDb(), nurse, { patientId, status })).filter(
    (a) => a.kind === "lung_protection",
  );
}

describe("a ventilator order", () => {
  it("stores the mode, the target per kg and the predicted body weight it was written against", async () => {
    const { order } = await ventilatedPatient();
    // Female, 165 cm: 45.5 + 0.91 × (165 − 152.4) = 56.966 kg (ARDS Network, NEJM 2000;342:1301).
    expect(order.ventilator).toEqual({
      mode: "volume_control",
      vtTargetMlKg: 6,
      vtMinMlKg: 4,
      vtMaxMlKg: 8,
      rateMin: 12,
      rateMax: 30,
      plateauLimit: 30,
      drivingLimit: 15,
      pbwKg: 57,
      heightCm: 165,
    });
  });

  it("takes the plateau and driving-pressure limits' defaults, 30 and 15 cmH2O, when none are given", async () => {
    const { patientId } = await admitTestPatient("MICU");
    const written = (await writeOrderOperation.invoke(
      appDb(),
      physician,
      ventilatorOrder(patientId, { plateauLimit: undefined, drivingLimit: undefined }),
    )) as OrderView;
    expect(written.ventilator).toMatchObject({ plateauLimit: 30, drivingLimit: 15 });
  });

  it("is refused naming height when the patient's height is not recorded, and writes nothing", async () => {
    const { patientId } = await admitTestPatient("MICU");
    await appDb()("patients").where({ id: patientId }).update({ height_cm: null });
    const ledgerBefore = await appDb()("ledger_entries")
      .where({ patient_id: patientId })
      .count({ n: "*" });
    const refusal = writeOrderOperation.invoke(appDb(), physician, ventilatorOrder(patientId));
    await expect(refusal).rejects.toMatchObject({
      status: 400,
      fieldErrors: { heightCm: [expect.stringContaining("Height is not recorded")] },
    });
    expect(await appDb()("orders").where({ patient_id: patientId }).count({ n: "*" })).toEqual([
      { n: 0 },
    ]);
    expect(
      await appDb()("ledger_entries").where({ patient_id: patientId }).count({ n: "*" }),
    ).toEqual(ledgerBefore);

    // Recorded at the bedside (a ledger row), the same order is then accepted.
    await recordHeightOperation.invoke(appDb(), therapist, { patientId, heightCm: 180 });
    const written = (await writeOrderOperation.invoke(
      appDb(),
      physician,
      ventilatorOrder(patientId),
    )) as OrderView;
    // Male would be 50 + …; this patient is female: 45.5 + 0.91 × 27.6 = 70.616 kg.
    expect(written.ventilator).toMatchObject({ pbwKg: 70.6, heightCm: 180 });
    const heightRows = await appDb()("ledger_entries")
      .where({ patient_id: patientId, action: "patient.update" })
      .count({ n: "*" });
    expect(heightRows).toEqual([{ n: 1 }]);
  });

  it("refuses ventilator settings on a device without a ventilator, naming the field", async () => {
    const { patientId } = await admitTestPatient("MICU");
    await expect(
      writeOrderOperation.invoke(appDb(), physician, hfncOrder(patientId, { vtTarget: 6 })),
    ).rejects.toMatchObject({ status: 400, fieldErrors: { vtTarget: [expect.any(String)] } });
  });

  it("refuses a tidal volume target outside its range, naming the field and the range", async () => {
    const { patientId } = await admitTestPatient("MICU");
    await expect(
      writeOrderOperation.invoke(appDb(), physician, ventilatorOrder(patientId, { vtTarget: 12 })),
    ).rejects.toMatchObject({
      status: 400,
      fieldErrors: {
        vtTarget: expect.arrayContaining([
          "Tidal volume target must be between 4 and 10 mL/kg PBW.",
        ]) as unknown,
      },
    });
  });
});

describe("a ventilator check", () => {
  it("with plateau 33 cmH2O on an order limited to 30 raises one lung-protection alert and one e-mail per recipient; a check back within limits resolves it", async () => {
    const { patientId } = await ventilatedPatient();
    const t0 = new Date();
    const first = await check(patientId, t0, { plateau: 33, peak: 38 });
    expect(first.breaches).toEqual([
      { what: "plateau", value: 33, limit: 30, unit: "cmH2O" },
      { what: "driving_pressure", value: 23, limit: 15, unit: "cmH2O" },
    ]);

    const [alert, ...others] = await lungAlerts(patientId);
    expect(others).toEqual([]);
    expect(alert).toMatchObject({ kind: "lung_protection", state: "opened", escalationLevel: 2 });
    const queued = (await appDb()("mail_outbox")
      .where({ alert_id: alert!.id })
      .orderBy("recipient_user_id")
      .pluck("recipient_user_id")) as number[];
    expect(queued).toEqual([physician.id, therapist.id].sort((a, b) => a - b));

    // A second check still beyond the limits: the same alert, no new e-mail.
    await check(patientId, new Date(t0.getTime() + 5 * MIN), { plateau: 32, peak: 37 }).then(
      () => undefined,
    );
    await runAlertWork(appDb(), sender(), new Date(t0.getTime() + 6 * MIN), cfg);
    await runAlertWork(appDb(), sender(), new Date(t0.getTime() + 7 * MIN), cfg);
    expect(await lungAlerts(patientId)).toHaveLength(1);
    const mails = mailsFor(alert!.id);
    expect(mails.map((m) => m.to[0]).sort()).toEqual([physician.email, therapist.email].sort());
    const toTherapist = mails.find((m) => m.to[0] === therapist.email)!;
    expect(toTherapist.messageId).toBe(
      `<alert-${alert!.id}.notify.${therapist.id}@kestrel.example>`,
    );
    expect(toTherapist.subject).toBe(`Lung protection — MICU bed ${await bedLabel(patientId)}`);
    expect(toTherapist.text).toContain("plateau pressure 33 cmH2O (limit 30)");
    expect(toTherapist.text).toContain("as the assigned therapist");
    const toPhysician = mails.find((m) => m.to[0] === physician.email)!;
    expect(toPhysician.text).toContain("as the responsible physician");

    const back = await check(patientId, new Date(t0.getTime() + 30 * MIN), {
      plateau: 24,
      peak: 30,
    });
    expect(back.breaches).toEqual([]);
    expect(await lungAlerts(patientId)).toEqual([]);
    const [resolved] = await lungAlerts(patientId, "all");
    expect(resolved!.resolved).toMatchObject({
      at: new Date(t0.getTime() + 30 * MIN).toISOString(),
      reason: "A later ventilator check within the order's lung-protective limits.",
    });
    await runAlertWork(appDb(), sender(), new Date(t0.getTime() + 31 * MIN), cfg);
    expect(mailsFor(alert!.id)).toHaveLength(2);
  });

  it("raises the alert on VT per kg above the order's range, and not on one at its top", async () => {
    const { patientId } = await ventilatedPatient();
    const t0 = new Date();
    // 456 mL / 56.966 kg = 8.0 mL/kg: at the top of 4–8, within.
    const atTop = await check(patientId, t0, { measuredVt: 456 });
    expect(atTop.breaches).toEqual([]);
    expect(await lungAlerts(patientId)).toEqual([]);
    // 490 mL / 56.966 kg = 8.6 mL/kg: above.
    const above = await check(patientId, new Date(t0.getTime() + MIN), { measuredVt: 490 });
    expect(above.breaches).toEqual([
      { what: "vt_per_kg", value: 8.6, limit: 8, unit: "mL/kg PBW" },
    ]);
    expect(await lungAlerts(patientId)).toHaveLength(1);
  });

  it("is written with its ledger row in one transaction: a failure in the alert step leaves neither", async () => {
    const { patientId } = await ventilatedPatient();
    const count = async (table: string, where: Record<string, unknown>) =>
      Number(((await appDb()(table).where(where).count({ n: "*" })) as { n: number }[])[0]!.n);
    const ledgerBefore = await count("ledger_entries", { patient_id: patientId });

    failAlert.next = true;
    await expect(check(patientId, new Date(), { plateau: 33, peak: 38 })).rejects.toThrow(
      "alert step failed",
    );
    expect(await count("ventilator_checks", { patient_id: patientId })).toBe(0);
    expect(await count("ledger_entries", { patient_id: patientId })).toBe(ledgerBefore);

    const saved = await check(patientId, new Date(), { plateau: 33, peak: 38 });
    const rows = (await appDb()("ledger_entries")
      .where({ patient_id: patientId, entity_type: "ventilator_check" })
      .select("action", "entity_id")) as { action: string; entity_id: string }[];
    expect(rows).toEqual([{ action: "ventilator_check.record", entity_id: String(saved.id) }]);
  });

  it("computes each value with its basis, PaCO2 from the latest arterial gas, and reads back newest first", async () => {
    const { patientId } = await ventilatedPatient();
    const t0 = new Date();
    const { id: admissionId } = (await appDb()("admissions")
      .where({ patient_id: patientId })
      .first("id")) as { id: number };
    await appDb()("blood_gases").insert({
      patient_id: patientId,
      admission_id: admissionId,
      sampled_at: new Date(t0.getTime() - 30 * MIN),
      sample_type: "arterial",
      pao2_mmhg: 80,
      paco2_mmhg: 45,
      device: "invasive",
      fio2: 0.4,
      fio2_estimated: false,
      barometric_pressure_mmhg: 760,
      indices_json: "null",
      engine_version: "test",
      recorded_by: therapist.id,
    });
    const saved = await check(patientId, t0, { measuredVt: 342, plateau: 24, peak: 30 });
    // VT/kg 342 / 56.966 = 6.00; ΔP 24 − 10 = 14; Cstat 342 / 14 = 24.4 mL/cmH2O;
    // MP 0.098 × 22 × 0.342 × (30 − 7) = 16.96 J/min; VR 7500 × 45 / (56.966 × 100 × 37.5) = 1.58.
    expect(saved.indices.vtPerKg.value).toBeCloseTo(6.0, 2);
    expect(saved.indices.drivingPressure!.value).toBe(14);
    expect(saved.indices.staticCompliance!.value).toBeCloseTo(24.43, 2);
    expect(saved.indices.mechanicalPower!.value).toBeCloseTo(16.96, 2);
    expect(saved.indices.ventilatoryRatio!.value).toBeCloseTo(1.58, 2);
    expect(saved.indices.ventilatoryRatio!.basis.inputs.PaCO2).toEqual({ value: 45, unit: "mmHg" });
    expect(saved.paco2).toMatchObject({ value: 45 });
    expect(saved.indices.drivingPressure!.basis.source).toContain("Amato");

    const later = await check(patientId, new Date(t0.getTime() + MIN));
    const read = await readVentilatorChecksOperation.invoke(appDb(), nurse, { patientId });
    expect(read.map((c) => c.id)).toEqual([later.id, saved.id]);
  });

  it("is refused without a ventilator order in effect, and to a nurse", async () => {
    const { patientId } = await admitTestPatient("MICU");
    await writeOrderOperation.invoke(appDb(), physician, hfncOrder(patientId));
    await expect(check(patientId, new Date())).rejects.toMatchObject({
      status: 400,
      fieldErrors: { patientId: [expect.stringContaining("ventilator order")] },
    });
    await expect(
      recordVentilatorCheckOperation.invoke(appDb(), nurse, {
        patientId,
        checkedAt: new Date().toISOString(),
        measuredVt: 400,
        measuredRate: 20,
        totalPeep: 8,
      }),
    ).rejects.toMatchObject({ status: 403 });
  });

  it("refuses a plateau below total PEEP + 1, naming the field", async () => {
    const { patientId } = await ventilatedPatient();
    await expect(
      check(patientId, new Date(), { plateau: 10, totalPeep: 10 }),
    ).rejects.toMatchObject({
      status: 400,
      fieldErrors: { plateau: [expect.stringContaining("at least total PEEP + 1")] },
    });
  });
});

async function bedLabel(patientId: number): Promise<string> {
  const row = (await appDb()("admissions as a")
    .join("beds as b", "b.id", "a.bed_id")
    .where("a.patient_id", patientId)
    .first("b.label")) as { label: string };
  return row.label;
}

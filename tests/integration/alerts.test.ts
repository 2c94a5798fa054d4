import { recordAdjustmentOperation } from "@/lib/adjustments/operations";
import {
  acknowledgeAlertOperation,
  resolveAlertOperation,
  saveEmailPreferencesOperation,
} from "@/lib/alerts/operations";
import { recordBloodGasOperation } from "@/lib/blood-gases/operations";
import { confirmImportOperation, previewUpload } from "@/lib/imports/operations";
import { writeOrderOperation } from "@/lib/orders/operations";
import { chartReadingOperation } from "@/lib/readings/operations";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { DEFAULT_DETECTION } from "@/lib/alerts/detect";
import type { AlertConfig } from "@/lib/alerts/config";
import { getEmailPreferences, listAlerts } from "@/lib/alerts/queries";
import {
  afterReadingsCharted,
  openOverdueReassessments,
  raiseSignalLosses,
} from "@/lib/alerts/service";
import { runAlertWork } from "@/lib/alerts/worker";
import type { Actor } from "@/lib/auth/actor";
import { closeDb } from "@/lib/db";
import { type UploadInput } from "@/lib/imports/service";
import { SYSTEM_ACTOR } from "@/lib/ledger/service";
import { startFakeInbox, type FakeInbox } from "@/lib/mail/fake-inbox";
import { createMailTransport } from "@/lib/mail/transport";
import type { OrderInput } from "@/lib/orders/schema";
import { SEEDED, actorByEmail, admitTestPatient, appDb } from "../helpers/db";
import { hfncOrder } from "../helpers/orders";

// The real chain: services write the alert and its outbox row in the reading's
// transaction; the worker pass (with an injected clock, never a sleep) sends
// through nodemailer to the local SMTP fake over TCP. Low values are charted by
// a colleague of the assigned nurse unless a test says otherwise: the nurse who
// charts a value herself is at the bedside and is not e-mailed about it.

const cfg: AlertConfig = {
  ...DEFAULT_DETECTION,
  escalateAfterMs: 10 * 60_000,
  limitsSettleMs: 5 * 60_000,
};
const MIN = 60_000;
/** The second nurse of the seeded medical ICU: not assigned to the test beds. */
const COLLEAGUE = "felix.adeyemi@kestrel.example";

let inbox: FakeInbox;
let smtpPort: number;
let nurse: Actor;
let therapist: Actor;
let physician: Actor;
let colleague: Actor;

const sender = () => createMailTransport({ host: "127.0.0.1", port: smtpPort });

beforeAll(async () => {
  inbox = await startFakeInbox({ smtpPort: 0, httpPort: null });
  smtpPort = inbox.smtpPort;
  [nurse, therapist, physician, colleague] = await Promise.all([
    actorByEmail(SEEDED.nurse),
    actorByEmail(SEEDED.therapist),
    actorByEmail(SEEDED.physician),
    actorByEmail(COLLEAGUE),
  ]);
});

afterAll(async () => {
  await inbox.stop();
  await closeDb();
});

/** A fresh patient on a fresh bed with this shift's nurse, therapist and physician assigned. */
async function assignedPatient(order: Partial<OrderInput> = {}) {
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
  await writeOrderOperation.invoke(
    appDb(),
    physician,
    hfncOrder(admitted.patientId, {
      reassessMinutes: 60,
      rationale: "Pneumonia, alert tests",
      ...order,
    }),
  );
  return admitted;
}

async function chartLow(patientId: number, spo2 = 88, at = new Date(), by = colleague) {
  return chartReadingOperation.invoke(
    appDb(),
    by,
    { patientId, takenAt: at.toISOString(), spo2, device: "hfnc", fio2: 0.4, flow: 40 },
    at,
  );
}

async function openAlertsOf(patientId: number) {
  return listAlerts(appDb(), nurse, { patientId, status: "open" });
}

const mailsFor = (alertId: number) =>
  inbox.messages().filter((m) => m.headers["x-tidemark-alert"] === String(alertId));

async function ledgerActions(alertId: number): Promise<string[]> {
  return (await appDb()("ledger_entries")
    .where({ entity_type: "alert", entity_id: String(alertId) })
    .orderBy("id")
    .pluck("action")) as string[];
}

describe("an excursion charted at the bedside", () => {
  it("opens an alert with the reading and mails the assigned nurse exactly once", async () => {
    const { patientId } = await assignedPatient();
    const t0 = new Date();
    await chartLow(patientId, 88, t0);

    const [alert] = await openAlertsOf(patientId);
    expect(alert).toMatchObject({
      kind: "below_band",
      grade: "routine",
      state: "opened",
      triggerSpo2: 88,
    });
    expect(alert!.band).toEqual({ lower: 92, upper: 96 });
    const queued = await appDb()("mail_outbox")
      .where({ alert_id: alert!.id })
      .select("recipient_user_id", "state");
    expect(queued).toEqual([{ recipient_user_id: nurse.id, state: "pending" }]);

    const pass = await runAlertWork(appDb(), sender(), new Date(t0.getTime() + 1000), cfg);
    expect(pass.failed).toBe(0);
    const mails = mailsFor(alert!.id);
    expect(mails).toHaveLength(1);
    const mail = mails[0]!;
    expect(mail.to).toEqual([nurse.email]);
    expect(mail.messageId).toBe(`<alert-${alert!.id}.notify.${nurse.id}@kestrel.example>`);
    expect(mail.subject).toContain("SpO2 below target");
    expect(mail.text).toContain("SpO2 88 %");
    expect(mail.html).toContain("/alerts?alert=");
    // The minimum necessary: never the patient's name or record number.
    const patient = (await appDb()("patients")
      .where({ id: patientId })
      .first("mrn", "family_name", "given_name")) as {
      mrn: string;
      family_name: string;
      given_name: string;
    };
    for (const part of [mail.subject, mail.text, mail.html]) {
      expect(part).not.toContain(patient.family_name);
      expect(part).not.toContain(patient.mrn);
    }

    const [after] = await openAlertsOf(patientId);
    expect(after!.state).toBe("notified");
    expect(after!.lastMailAt).toBe(new Date(t0.getTime() + 1000).toISOString());
    // The e-mail's link (?alert=) shows that alert alone, whatever its state.
    const linked = await listAlerts(appDb(), nurse, { alertId: alert!.id, status: "all" });
    expect(linked.map((a) => a.id)).toEqual([alert!.id]);
    await runAlertWork(appDb(), sender(), new Date(t0.getTime() + 2000), cfg);
    expect(mailsFor(alert!.id)).toHaveLength(1);
    expect(await ledgerActions(alert!.id)).toEqual(["alert.open", "alert.notify"]);
  });

  it("stops escalating once acknowledged", async () => {
    const { patientId } = await assignedPatient();
    const t0 = new Date();
    await chartLow(patientId, 89, t0);
    const [alert] = await openAlertsOf(patientId);
    await runAlertWork(appDb(), sender(), new Date(t0.getTime() + 1000), cfg);
    await acknowledgeAlertOperation.invoke(
      appDb(),
      nurse,
      { alertId: alert!.id, note: "Suctioned, repositioned" },
      new Date(t0.getTime() + 2 * MIN),
    );

    await runAlertWork(appDb(), sender(), new Date(t0.getTime() + 11 * MIN), cfg);
    await runAlertWork(appDb(), sender(), new Date(t0.getTime() + 25 * MIN), cfg);
    expect(mailsFor(alert!.id).map((m) => m.to[0])).toEqual([nurse.email]);
    const [after] = await openAlertsOf(patientId);
    expect(after).toMatchObject({
      state: "acknowledged",
      escalationLevel: 0,
      nextEscalationAt: null,
    });
    expect(after!.acknowledged).toMatchObject({ by: nurse.name, note: "Suctioned, repositioned" });
    expect(await ledgerActions(alert!.id)).toEqual([
      "alert.open",
      "alert.notify",
      "alert.acknowledge",
    ]);
  });

  it("escalates to the therapist, then the physician, on schedule when nobody acknowledges", async () => {
    const { patientId } = await assignedPatient();
    const t0 = new Date();
    await chartLow(patientId, 90, t0);
    const [alert] = await openAlertsOf(patientId);
    const at = (ms: number) => runAlertWork(appDb(), sender(), new Date(t0.getTime() + ms), cfg);

    await at(1000);
    await at(9 * MIN);
    expect(mailsFor(alert!.id).map((m) => m.to[0])).toEqual([nurse.email]);
    await at(10 * MIN + 1000);
    expect(mailsFor(alert!.id).map((m) => m.to[0])).toEqual([nurse.email, therapist.email]);
    await at(19 * MIN);
    expect(mailsFor(alert!.id)).toHaveLength(2);
    await at(20 * MIN + 2000);
    expect(mailsFor(alert!.id).map((m) => m.to[0])).toEqual([
      nurse.email,
      therapist.email,
      physician.email,
    ]);
    expect(mailsFor(alert!.id)[2]!.subject).toMatch(/^Escalated: /);
    // The physician is the last level: nothing further.
    await at(60 * MIN);
    expect(mailsFor(alert!.id)).toHaveLength(3);
    const [after] = await openAlertsOf(patientId);
    expect(after).toMatchObject({ state: "escalated", escalationLevel: 2, nextEscalationAt: null });
    expect(await ledgerActions(alert!.id)).toEqual([
      "alert.open",
      "alert.notify",
      "alert.escalate",
      "alert.notify",
      "alert.escalate",
      "alert.notify",
    ]);
  });

  it("resolves when back in band and upgrades to urgent on a deeper fall", async () => {
    const { patientId } = await assignedPatient();
    const t0 = Date.now() - 10 * MIN;
    await chartLow(patientId, 90, new Date(t0));
    await chartLow(patientId, 84, new Date(t0 + MIN));
    const [alert] = await openAlertsOf(patientId);
    expect(alert).toMatchObject({ grade: "urgent", worstSpo2: 84 });
    await chartLow(patientId, 94, new Date(t0 + 2 * MIN));
    expect(await openAlertsOf(patientId)).toEqual([]);
    const [resolved] = await listAlerts(appDb(), nurse, { patientId, status: "resolved" });
    // Resolved by detection (the in-band reading), not closed by hand.
    expect(resolved!.resolved).toEqual({
      at: new Date(t0 + 2 * MIN).toISOString(),
      by: null,
      reason: "Back in the target band: a charted value in band.",
    });
    expect(await ledgerActions(alert!.id)).toEqual([
      "alert.open",
      "alert.upgrade",
      "alert.resolve",
    ]);
    // Resolved before the worker sent anything: both e-mails are cancelled, with the reason.
    const outbox = (await appDb()("mail_outbox")
      .where({ alert_id: alert!.id })
      .orderBy("id")
      .select("purpose", "state", "cancel_reason")) as Record<string, unknown>[];
    expect(outbox).toEqual([
      {
        purpose: "notify",
        state: "cancelled",
        cancel_reason: expect.stringMatching(/resolved/) as unknown,
      },
      {
        purpose: "urgent",
        state: "cancelled",
        cancel_reason: expect.stringMatching(/resolved/) as unknown,
      },
    ]);
    await runAlertWork(appDb(), sender(), new Date(), cfg);
    expect(mailsFor(alert!.id)).toEqual([]);
  });
});

describe("mail down", () => {
  it("queues while the relay is down and delivers each e-mail exactly once after it returns", async () => {
    const a = await assignedPatient();
    const b = await assignedPatient();
    await inbox.stop();
    try {
      const t0 = new Date();
      await chartLow(a.patientId, 88, t0);
      await chartLow(b.patientId, 87, t0);
      const ids = [
        (await openAlertsOf(a.patientId))[0]!.id,
        (await openAlertsOf(b.patientId))[0]!.id,
      ];
      const down = await runAlertWork(appDb(), sender(), new Date(t0.getTime() + 1000), cfg);
      expect(down.failed).toBeGreaterThanOrEqual(2);
      const rows = (await appDb()("mail_outbox")
        .whereIn("alert_id", ids)
        .select("state", "attempts", "last_error")) as {
        state: string;
        attempts: number;
        last_error: string | null;
      }[];
      expect(rows.map((r) => [r.state, r.attempts])).toEqual([
        ["pending", 1],
        ["pending", 1],
      ]);
      expect(rows.every((r) => r.last_error)).toBe(true);
      // Alerts stay in the app, unnotified, while mail is down.
      for (const id of ids)
        expect(
          ((await appDb()("alerts").where({ id }).first("state")) as { state: string }).state,
        ).toBe("opened");

      inbox = await startFakeInbox({ smtpPort, httpPort: null });
      // Not yet due: the first retry waits 30 s.
      await runAlertWork(appDb(), sender(), new Date(t0.getTime() + 10_000), cfg);
      for (const id of ids) expect(mailsFor(id)).toHaveLength(0);
      await runAlertWork(appDb(), sender(), new Date(t0.getTime() + 45_000), cfg);
      await runAlertWork(appDb(), sender(), new Date(t0.getTime() + 2 * MIN), cfg);
      for (const id of ids) {
        const mails = mailsFor(id);
        expect(mails).toHaveLength(1);
        expect(new Set(inbox.messages().map((m) => m.messageId)).size).toBe(
          inbox.messages().length,
        );
        expect(
          ((await appDb()("alerts").where({ id }).first("state")) as { state: string }).state,
        ).toBe("notified");
      }
    } finally {
      if (!inbox) inbox = await startFakeInbox({ smtpPort, httpPort: null });
    }
  });
});

describe("monitor series", () => {
  async function watchContext(patientId: number, unitId: number, bedId: number) {
    const admission = (await appDb()("admissions")
      .where({ patient_id: patientId })
      .first("id")) as { id: number };
    return { admissionId: admission.id, patientId, unitId, bedId };
  }
  const series = (from: number, values: number[]) =>
    values.map((spo2, i) => ({
      takenAt: new Date(from + i * 1000),
      spo2,
      fio2: 0.4,
      flow: 40,
      source: "monitor" as const,
    }));

  it("continues the sliding window across batches: 80 % of a minute out of band opens", async () => {
    const { patientId, unitId, bedId } = await assignedPatient();
    const ctx = await watchContext(patientId, unitId, bedId);
    const start = Date.now() - 30 * MIN;
    const batch = (from: number, values: number[]) =>
      appDb().transaction((trx) =>
        afterReadingsCharted(trx, SYSTEM_ACTOR, ctx, series(from, values), new Date(), cfg),
      );
    // A minute in band, then 30 s at 89 % (3 points under, routine depth): 29 s below so far.
    await batch(start, [...Array<number>(60).fill(95), ...Array<number>(30).fill(89)]);
    expect(await openAlertsOf(patientId)).toEqual([]);
    // The next batch continues the window: 48 s of the last 60 below at t = 108 s.
    await batch(start + 90_000, Array<number>(30).fill(89));
    const [alert] = await openAlertsOf(patientId);
    expect(alert).toMatchObject({
      kind: "below_band",
      grade: "routine",
      startedAt: new Date(start + 60_000).toISOString(),
      detail: { confirmedAt: new Date(start + 108_000).toISOString(), confirmedBy: "monitor" },
    });
  });

  it("imports a monitor CSV of 75 % with an in-band blip every 45 s: one alert, one e-mail", async () => {
    const { patientId, unitId, bedId } = await assignedPatient();
    const { mrn } = (await appDb()("patients").where({ id: patientId }).first("mrn")) as {
      mrn: string;
    };
    const { label } = (await appDb()("beds").where({ id: bedId }).first("label")) as {
      label: string;
    };
    const now = new Date();
    // Ten minutes at 1 Hz ending now: a minute in band, then 75 % with 94 % every 45 s.
    const values = Array.from({ length: 600 }, (_, i) => (i < 60 || i % 45 === 0 ? 94 : 75));
    const from = now.getTime() - 600_000;
    const csv = [
      "time,spo2",
      ...values.map((v, i) => `${new Date(from + i * 1000).toISOString()},${v}`),
    ].join("\n");
    const preview = await previewUpload(
      appDb(),
      therapist,
      { kind: "monitor_csv", unitId, fileName: "blips.csv", mrn, bed: label } as UploadInput,
      Buffer.from(csv, "utf8"),
      now,
    );
    await confirmImportOperation.invoke(
      appDb(),
      therapist,
      { importId: preview.id, expectedAccepted: 600 },
      now,
    );

    const alerts = await listAlerts(appDb(), nurse, { patientId, status: "all" });
    expect(alerts.map((a) => [a.kind, a.grade, a.state])).toEqual([
      ["below_band", "urgent", "opened"],
    ]);
    const alert = alerts[0]!;
    // Urgent depth (under 85 %): 12 of the last 15 s open it, however the blips fall.
    expect(Date.parse(alert.detail.confirmedAt as string) - from).toBeLessThanOrEqual(90_000);
    await runAlertWork(appDb(), sender(), new Date(now.getTime() + 1000), cfg);
    await runAlertWork(appDb(), sender(), new Date(now.getTime() + 2000), cfg);
    expect(mailsFor(alert.id).map((m) => m.to[0])).toEqual([nurse.email]);
    expect(mailsFor(alert.id)[0]!.subject).toMatch(/urgent/i);
  });

  it("raises signal loss when the probe goes off after one low sample, mails the nurse, and clears on the next sample", async () => {
    const { patientId, unitId, bedId } = await assignedPatient();
    const ctx = await watchContext(patientId, unitId, bedId);
    const t0 = Date.now() - 10 * MIN;
    await appDb().transaction((trx) =>
      afterReadingsCharted(
        trx,
        SYSTEM_ACTOR,
        ctx,
        series(t0, [...Array<number>(60).fill(95), 80]),
        new Date(t0 + 61_000),
        cfg,
      ),
    );
    expect(await openAlertsOf(patientId)).toEqual([]);
    // Silence: nothing after 120 s, the next after.
    expect(await raiseSignalLosses(appDb(), new Date(t0 + 60_000 + 119_000), cfg)).toBe(0);
    await raiseSignalLosses(appDb(), new Date(t0 + 60_000 + 121_000), cfg);
    const [lost] = await openAlertsOf(patientId);
    expect(lost).toMatchObject({
      kind: "signal_loss",
      worstSpo2: 80,
      detail: {
        lastSampleAt: new Date(t0 + 60_000).toISOString(),
        excursion: { phase: "pending", direction: "below" },
      },
    });
    // Once per silence.
    await raiseSignalLosses(appDb(), new Date(t0 + 5 * MIN), cfg);
    expect(await openAlertsOf(patientId)).toHaveLength(1);
    await runAlertWork(appDb(), sender(), new Date(t0 + 5 * MIN), cfg);
    expect(mailsFor(lost!.id).map((m) => m.to[0])).toEqual([nurse.email]);
    expect(mailsFor(lost!.id)[0]!.subject).toMatch(/signal/i);

    await appDb().transaction((trx) =>
      afterReadingsCharted(
        trx,
        SYSTEM_ACTOR,
        ctx,
        series(t0 + 6 * MIN, [95]),
        new Date(t0 + 6 * MIN),
        cfg,
      ),
    );
    expect(await openAlertsOf(patientId)).toEqual([]);
    const [restored] = await listAlerts(appDb(), nurse, { patientId, status: "resolved" });
    expect(restored!.resolved?.reason).toBe("The monitor's signal is back.");
  });

  it("keeps a monitor-confirmed alert open through an in-band spot check, and offers it as the closing reason", async () => {
    const { patientId, unitId, bedId } = await assignedPatient();
    const ctx = await watchContext(patientId, unitId, bedId);
    const t0 = Date.now() - 10 * MIN;
    await appDb().transaction((trx) =>
      afterReadingsCharted(
        trx,
        SYSTEM_ACTOR,
        ctx,
        series(t0, Array<number>(90).fill(89)),
        new Date(t0 + 90_000),
        cfg,
      ),
    );
    const [alert] = await openAlertsOf(patientId);
    expect(alert!.kind).toBe("below_band");
    await chartLow(patientId, 95, new Date(t0 + 100_000));
    // The monitor goes on at 89 %: still the same one alert, never a second.
    await appDb().transaction((trx) =>
      afterReadingsCharted(
        trx,
        SYSTEM_ACTOR,
        ctx,
        series(t0 + 101_000, Array<number>(120).fill(89)),
        new Date(t0 + 221_000),
        cfg,
      ),
    );
    const open = await openAlertsOf(patientId);
    expect(open.map((a) => a.id)).toEqual([alert!.id]);
    expect(open[0]!.detail.spotCheck).toEqual({
      spo2: 95,
      at: new Date(t0 + 100_000).toISOString(),
    });
    expect(await ledgerActions(alert!.id)).toEqual(["alert.open"]);
  });
});

describe("the charting nurse and the e-mail", () => {
  it("SpO2 45 % charted by a colleague: an urgent alert and one e-mail to the assigned nurse", async () => {
    const { patientId } = await assignedPatient();
    const t0 = new Date();
    const reading = await chartLow(patientId, 45, t0);
    expect(reading.spo2).toBe(45);
    const [alert] = await openAlertsOf(patientId);
    expect(alert).toMatchObject({ kind: "below_band", grade: "urgent", triggerSpo2: 45 });
    await runAlertWork(appDb(), sender(), new Date(t0.getTime() + 1000), cfg);
    await runAlertWork(appDb(), sender(), new Date(t0.getTime() + 2000), cfg);
    const mails = mailsFor(alert!.id);
    expect(mails.map((m) => m.to[0])).toEqual([nurse.email]);
    expect(mails[0]!.text).toContain("SpO2 45 % (below oximeter accuracy)");
  });

  it("SpO2 0 % is charted and alerted", async () => {
    const { patientId } = await assignedPatient();
    await chartLow(patientId, 0);
    expect((await openAlertsOf(patientId)).map((a) => [a.grade, a.triggerSpo2])).toEqual([
      ["urgent", 0],
    ]);
  });

  it("does not e-mail the nurse who charted the value herself; the alert still opens and escalates", async () => {
    const { patientId } = await assignedPatient();
    const t0 = new Date();
    await chartLow(patientId, 45, t0, nurse);
    const [alert] = await openAlertsOf(patientId);
    expect(alert).toMatchObject({ kind: "below_band", grade: "urgent" });
    expect(await appDb()("mail_outbox").where({ alert_id: alert!.id }).count({ n: "*" })).toEqual([
      { n: 0 },
    ]);
    const opened = (await appDb()("ledger_entries")
      .where({ entity_type: "alert", entity_id: String(alert!.id), action: "alert.open" })
      .first("after_json")) as { after_json: string };
    expect(JSON.parse(opened.after_json)).toMatchObject({ notMailedAtBedside: [nurse.id] });
    await runAlertWork(appDb(), sender(), new Date(t0.getTime() + 10 * MIN + 1000), cfg);
    expect(mailsFor(alert!.id).map((m) => m.to[0])).toEqual([therapist.email]);
  });
});

describe("PaO2 above the order's band", () => {
  it("opens on an arterial gas above the band on oxygen, and closes when the settings are weaned", async () => {
    const { patientId } = await assignedPatient({ pao2Lower: 60, pao2Upper: 100 });
    const t0 = new Date(Date.now() - 5 * MIN);
    await recordBloodGasOperation.invoke(
      appDb(),
      therapist,
      {
        patientId,
        sampledAt: t0.toISOString(),
        sampleType: "arterial",
        pao2: 160,
        paco2: 40,
        device: "hfnc",
        fio2: 0.4,
        flow: 40,
      },
      t0,
    );
    const [alert] = await openAlertsOf(patientId);
    expect(alert).toMatchObject({
      kind: "pao2_above_band",
      detail: { pao2: 160, pao2Band: { lower: 60, upper: 100 } },
    });
    const { version } = (await appDb()("bedside_settings")
      .join("admissions", "admissions.id", "bedside_settings.admission_id")
      .where({ "admissions.patient_id": patientId })
      .first("bedside_settings.version")) as { version: number };
    await recordAdjustmentOperation.invoke(appDb(), therapist, {
      patientId,
      settingsVersion: version,
      toFio2: 0.35,
      toFlow: 40,
      reason: "above_band",
      rationale: "PaO2 160 on FiO2 0.40: wean",
      appliedAt: new Date().toISOString(),
    });
    expect(await openAlertsOf(patientId)).toEqual([]);
    const [closed] = await listAlerts(appDb(), nurse, { patientId, status: "resolved" });
    expect(closed!.resolved?.reason).toMatch(/^Weaned: FiO2 0.4 → 0.35/);
  });
});

describe("limits, reassessment and closing by hand", () => {
  it("calls the physician when the order's FiO2 ceiling is reached and the patient is still below", async () => {
    const { patientId } = await assignedPatient({ initialFio2: 0.6 });
    const t0 = Date.now();
    // Taken right after the order set FiO2 0.6: too soon for the change to show.
    await chartLow(patientId, 89, new Date(t0));
    expect((await openAlertsOf(patientId)).map((a) => a.kind)).toEqual(["below_band"]);
    // Six minutes later, still below at the ceiling: the physician is called.
    await chartLow(patientId, 89, new Date(t0 + 6 * MIN));
    const open = await openAlertsOf(patientId);
    expect(open.map((a) => a.kind).sort()).toEqual(["below_band", "limits_exhausted"]);
    const limits = open.find((a) => a.kind === "limits_exhausted")!;
    expect(limits).toMatchObject({
      escalationLevel: 2,
      nextEscalationAt: null,
      detail: { limitsAtMax: ["fio2"] },
    });
    const to = (await appDb()("mail_outbox")
      .where({ alert_id: limits.id })
      .pluck("recipient_user_id")) as number[];
    expect(to).toEqual([physician.id]);

    // A new order with room to titrate answers it.
    await writeOrderOperation.invoke(
      appDb(),
      physician,
      hfncOrder(patientId, {
        fio2Max: 0.8,
        initialFio2: 0.6,
        initialFlow: 50,
        rationale: "More room to titrate",
        supersedesOrderId: (
          (await appDb()("orders").where({ current_patient_id: patientId }).first("id")) as {
            id: number;
          }
        ).id,
      }),
    );
    expect((await openAlertsOf(patientId)).map((a) => a.kind)).toEqual(["below_band"]);
  });

  it("opens an overdue reassessment after the order's interval and closes it on the next reading", async () => {
    const { patientId } = await assignedPatient({ reassessMinutes: 30 });
    const now = Date.now();
    await openOverdueReassessments(appDb(), new Date(now + 20 * MIN), cfg);
    expect(await openAlertsOf(patientId)).toEqual([]);
    await openOverdueReassessments(appDb(), new Date(now + 45 * MIN), cfg);
    await openOverdueReassessments(appDb(), new Date(now + 46 * MIN), cfg);
    const open = await openAlertsOf(patientId);
    expect(open.map((a) => a.kind)).toEqual(["reassessment_overdue"]);
    await chartLow(patientId, 94);
    expect(await openAlertsOf(patientId)).toEqual([]);
  });

  it("lets a clinician close with a reason, refuses the reviewer and a second acknowledgement", async () => {
    const { patientId } = await assignedPatient();
    await chartLow(patientId, 88);
    const [alert] = await openAlertsOf(patientId);
    const reviewer = await actorByEmail(SEEDED.reviewer);
    await expect(
      acknowledgeAlertOperation.invoke(appDb(), reviewer, { alertId: alert!.id }),
    ).rejects.toMatchObject({ status: 403 });
    await acknowledgeAlertOperation.invoke(appDb(), therapist, { alertId: alert!.id });
    await expect(
      acknowledgeAlertOperation.invoke(appDb(), nurse, { alertId: alert!.id }),
    ).rejects.toMatchObject({
      status: 409,
      message: expect.stringContaining(`Already acknowledged by ${therapist.name}`) as unknown,
    });
    await expect(
      resolveAlertOperation.invoke(appDb(), nurse, { alertId: alert!.id, reason: "" }),
    ).rejects.toMatchObject({
      status: 400,
      fieldErrors: { reason: [expect.stringContaining("at least 3 characters") as unknown] },
    });
    await resolveAlertOperation.invoke(appDb(), nurse, {
      alertId: alert!.id,
      reason: "Probe off the finger, rechecked 95 %",
    });
    const [closed] = await listAlerts(appDb(), nurse, { patientId, status: "resolved" });
    expect(closed!.resolved).toMatchObject({
      by: nurse.name,
      reason: "Probe off the finger, rechecked 95 %",
    });
  });

  it("with no nurse assigned, tells the unit's charge nurse or address instead, and escalates anyway", async () => {
    const { patientId, bedId } = await assignedPatient();
    await appDb()("care_assignments").where({ bed_id: bedId, duty: "nurse" }).delete();
    const t0 = new Date();
    await chartLow(patientId, 89, t0);
    const [alert] = await openAlertsOf(patientId);
    // Which of the two depends on the seeded charge duty; tests/integration/admissions.test.ts pins each.
    const told = alert!.detail.told as { level: number; recipients: { basis: string }[] };
    expect(told.level).toBe(0);
    expect(told.recipients.map((r) => r.basis)).toEqual([
      expect.stringMatching(/^(charge|fallback)$/),
    ]);
    expect(alert!.detail.unassignedLevel).toBeNull();
    await runAlertWork(appDb(), sender(), new Date(t0.getTime() + 10 * MIN + 1000), cfg);
    expect(mailsFor(alert!.id).map((m) => m.to[0])).toContain(therapist.email);
    const [after] = await openAlertsOf(patientId);
    expect(after).toMatchObject({ escalationLevel: 1, detail: { unassignedLevel: null } });
  });

  it("does not e-mail a user who turned e-mail off for that kind, and still shows the alert", async () => {
    const before = await getEmailPreferences(appDb(), nurse.id);
    await saveEmailPreferencesOperation.invoke(appDb(), nurse, { ...before, below_band: false });
    try {
      const { patientId } = await assignedPatient();
      await chartLow(patientId, 88);
      const [alert] = await openAlertsOf(patientId);
      expect(alert!.kind).toBe("below_band");
      expect(await appDb()("mail_outbox").where({ alert_id: alert!.id }).count({ n: "*" })).toEqual(
        [{ n: 0 }],
      );
    } finally {
      await saveEmailPreferencesOperation.invoke(appDb(), nurse, before);
    }
  });
});

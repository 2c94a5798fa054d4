import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { DEFAULT_DETECTION } from "@/lib/alerts/detect";
import type { AlertConfig } from "@/lib/alerts/config";
import { getEmailPreferences, listAlerts, setEmailPreferences } from "@/lib/alerts/queries";
import {
  acknowledgeAlert,
  afterReadingsCharted,
  openOverdueReassessments,
  resolveAlert,
} from "@/lib/alerts/service";
import { runAlertWork } from "@/lib/alerts/worker";
import type { Actor } from "@/lib/auth/actor";
import { closeDb } from "@/lib/db";
import { SYSTEM_ACTOR } from "@/lib/ledger/service";
import { startFakeInbox, type FakeInbox } from "@/lib/mail/fake-inbox";
import { createMailTransport } from "@/lib/mail/transport";
import type { OrderInput } from "@/lib/orders/schema";
import { writeOrder } from "@/lib/orders/service";
import { chartReading } from "@/lib/readings/service";
import { SEEDED, actorByEmail, admitTestPatient, appDb } from "../helpers/db";
import { hfncOrder } from "../helpers/orders";

// The real chain: services write the alert and its outbox row in the reading's
// transaction; the worker pass (with an injected clock, never a sleep) sends
// through nodemailer to the local SMTP fake over TCP.

const cfg: AlertConfig = { ...DEFAULT_DETECTION, escalateAfterMs: 10 * 60_000 };
const MIN = 60_000;

let inbox: FakeInbox;
let smtpPort: number;
let nurse: Actor;
let therapist: Actor;
let physician: Actor;

const sender = () => createMailTransport({ host: "127.0.0.1", port: smtpPort });

beforeAll(async () => {
  inbox = await startFakeInbox({ smtpPort: 0, httpPort: null });
  smtpPort = inbox.smtpPort;
  [nurse, therapist, physician] = await Promise.all([
    actorByEmail(SEEDED.nurse),
    actorByEmail(SEEDED.therapist),
    actorByEmail(SEEDED.physician),
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
  await writeOrder(
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

async function chartLow(patientId: number, spo2 = 88, at = new Date()) {
  return chartReading(
    appDb(),
    nurse,
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
    await acknowledgeAlert(
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
    // Resolved by detection (the nurse's in-band reading), not closed by her hand.
    expect(resolved!.resolved).toEqual({
      at: new Date(t0 + 2 * MIN).toISOString(),
      by: null,
      reason: "Back in the target band.",
    });
    expect(await ledgerActions(alert!.id)).toEqual([
      "alert.open",
      "alert.upgrade",
      "alert.resolve",
    ]);
    const outbox = (await appDb()("mail_outbox")
      .where({ alert_id: alert!.id })
      .orderBy("id")
      .pluck("purpose")) as string[];
    expect(outbox).toEqual(["notify", "urgent"]);
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
  it("opens only when a dip is sustained for the configured time", async () => {
    const { patientId, unitId, bedId } = await assignedPatient();
    const admission = (await appDb()("admissions")
      .where({ patient_id: patientId })
      .first("id")) as { id: number };
    const ctx = { admissionId: admission.id, patientId, unitId, bedId };
    const start = Date.now() - 30 * MIN;
    const series = (from: number, values: number[]) =>
      values.map((spo2, i) => ({
        takenAt: new Date(from + i * 1000),
        spo2,
        fio2: 0.4,
        flow: 40,
        source: "monitor" as const,
      }));

    await appDb().transaction((trx) =>
      afterReadingsCharted(
        trx,
        SYSTEM_ACTOR,
        ctx,
        series(start, [95, ...Array<number>(30).fill(85), 95]),
        new Date(),
        cfg,
      ),
    );
    expect(await openAlertsOf(patientId)).toEqual([]);
    // Batches continue where the last left off: 40 s now + 30 s next = sustained.
    await appDb().transaction((trx) =>
      afterReadingsCharted(
        trx,
        SYSTEM_ACTOR,
        ctx,
        series(start + 60_000, Array<number>(40).fill(89)),
        new Date(),
        cfg,
      ),
    );
    expect(await openAlertsOf(patientId)).toEqual([]);
    await appDb().transaction((trx) =>
      afterReadingsCharted(
        trx,
        SYSTEM_ACTOR,
        ctx,
        series(start + 100_000, Array<number>(30).fill(89)),
        new Date(),
        cfg,
      ),
    );
    const [alert] = await openAlertsOf(patientId);
    expect(alert).toMatchObject({
      kind: "below_band",
      startedAt: new Date(start + 60_000).toISOString(),
    });
  });
});

describe("limits, reassessment and closing by hand", () => {
  it("calls the physician when the order's FiO2 ceiling is reached and the patient is still below", async () => {
    const { patientId } = await assignedPatient({ initialFio2: 0.6 });
    await chartLow(patientId, 89);
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
    await writeOrder(
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
    await expect(acknowledgeAlert(appDb(), reviewer, { alertId: alert!.id })).rejects.toMatchObject(
      { status: 403 },
    );
    await acknowledgeAlert(appDb(), therapist, { alertId: alert!.id });
    await expect(acknowledgeAlert(appDb(), nurse, { alertId: alert!.id })).rejects.toMatchObject({
      status: 409,
      message: expect.stringContaining(`Already acknowledged by ${therapist.name}`) as unknown,
    });
    await expect(
      resolveAlert(appDb(), nurse, { alertId: alert!.id, reason: "" }),
    ).rejects.toMatchObject({
      status: 400,
      fieldErrors: { reason: [expect.stringContaining("at least 3 characters") as unknown] },
    });
    await resolveAlert(appDb(), nurse, {
      alertId: alert!.id,
      reason: "Probe off the finger, rechecked 95 %",
    });
    const [closed] = await listAlerts(appDb(), nurse, { patientId, status: "resolved" });
    expect(closed!.resolved).toMatchObject({
      by: nurse.name,
      reason: "Probe off the finger, rechecked 95 %",
    });
  });

  it("says when nobody holds the duty, and escalates anyway", async () => {
    const { patientId, bedId } = await assignedPatient();
    await appDb()("care_assignments").where({ bed_id: bedId, duty: "nurse" }).delete();
    const t0 = new Date();
    await chartLow(patientId, 89, t0);
    const [alert] = await openAlertsOf(patientId);
    expect(alert!.detail.unassignedLevel).toBe(0);
    expect(await appDb()("mail_outbox").where({ alert_id: alert!.id }).count({ n: "*" })).toEqual([
      { n: 0 },
    ]);
    await runAlertWork(appDb(), sender(), new Date(t0.getTime() + 10 * MIN + 1000), cfg);
    expect(mailsFor(alert!.id).map((m) => m.to[0])).toEqual([therapist.email]);
    const [after] = await openAlertsOf(patientId);
    expect(after).toMatchObject({ escalationLevel: 1, detail: { unassignedLevel: null } });
  });

  it("does not e-mail a user who turned e-mail off for that kind, and still shows the alert", async () => {
    const before = await getEmailPreferences(appDb(), nurse.id);
    await setEmailPreferences(appDb(), nurse, { ...before, below_band: false });
    try {
      const { patientId } = await assignedPatient();
      await chartLow(patientId, 88);
      const [alert] = await openAlertsOf(patientId);
      expect(alert!.kind).toBe("below_band");
      expect(await appDb()("mail_outbox").where({ alert_id: alert!.id }).count({ n: "*" })).toEqual(
        [{ n: 0 }],
      );
    } finally {
      await setEmailPreferences(appDb(), nurse, before);
    }
  });
});

import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { randomUUID } from "node:crypto";
import { deliverOutbox } from "@/lib/alerts/outbox";
import { hashPassword } from "@/lib/auth/password";
import { closeDb } from "@/lib/db";
import { startFakeInbox, type FakeInbox } from "@/lib/mail/fake-inbox";
import { createMailTransport } from "@/lib/mail/transport";
import { cosignNotices, remindCosigns } from "@/lib/orders/cosign-reminders";
import { cosignOrderOperation, writeOrderOperation } from "@/lib/orders/operations";
import type { OrderInput } from "@/lib/orders/schema";
import { actorByEmail, appDb, uniqueEmail } from "../helpers/db";
import { hfncOrder } from "../helpers/orders";

// A verbal order waiting for co-signature: reminded to its prescriber every
// interval and escalated to the unit's designated co-signers at the deadline,
// each step one ledger row and one e-mail per recipient — also when the sweep
// runs twice at once, as two workers on two servers would.

const MIN = 60_000;
const HOUR = 60 * MIN;
const PASSWORD = "tidemark-demo";
const cfg = { remindMs: 60 * MIN, escalateMs: 24 * HOUR };
let inbox: FakeInbox;
const sender = () => createMailTransport({ host: "127.0.0.1", port: inbox.smtpPort });

beforeAll(async () => {
  inbox = await startFakeInbox({ smtpPort: 0, httpPort: null });
});
afterAll(async () => {
  await inbox.stop();
  await closeDb();
});

async function person(role: "physician" | "nurse", unitId: number, designated = false) {
  const email = uniqueEmail(`cosign-${role}`);
  const [id] = await appDb()("users").insert({
    email,
    name: `Cosign ${role} ${email.slice(14, 20)}`,
    role,
    password_hash: await hashPassword(PASSWORD),
  });
  await appDb()("user_units").insert({ user_id: id, unit_id: unitId });
  if (designated) await appDb()("unit_cosigners").insert({ unit_id: unitId, user_id: id });
  return actorByEmail(email);
}

/**
 * A unit of the test's own (so its designated co-signer is known and the
 * sweep can be held to it), a patient in one of its beds, and a telephone
 * order a nurse took from a prescriber at `t0`.
 */
async function waitingOrder(t0: Date) {
  const tag = randomUUID().slice(0, 6).toUpperCase();
  const [unitId] = (await appDb()("units").insert({
    code: `CS${tag}`,
    name: `Co-sign test ${tag}`,
    kind: "ward",
    time_zone: "Europe/Berlin",
  })) as number[];
  const [bedId] = await appDb()("beds").insert({ unit_id: unitId, label: "C1" });
  const [patientId] = await appDb()("patients").insert({
    mrn: `CW${tag}`,
    family_name: "Cosignwait",
    given_name: "Rosa",
    birth_date: "1958-03-02",
    sex: "female",
    height_cm: 160,
  });
  await appDb()("admissions").insert({
    patient_id: patientId,
    bed_id: bedId,
    admitted_at: new Date(t0.getTime() - HOUR),
  });
  const prescriber = await person("physician", unitId!);
  const designated = await person("physician", unitId!, true);
  const nurse = await person("nurse", unitId!);
  const order = await writeOrderOperation.invoke(
    appDb(),
    nurse,
    {
      ...hfncOrder(Number(patientId)),
      entryMode: "telephone",
      prescriberId: prescriber.id,
      readBackConfirmed: true,
    } as unknown as OrderInput,
    t0,
  );
  return { order, prescriber, designated, unitId: unitId! };
}

/** Delivers the outbox, two workers at once, until this order's queued e-mails have left. */
async function deliverFor(orderId: number, now: Date): Promise<void> {
  for (let i = 0; i < 40; i++) {
    const waiting = (await appDb()("mail_outbox")
      .where("message_id", "like", `<order-${orderId}.cosign-%`)
      .where({ state: "pending" })
      .where("next_attempt_at", "<=", now)
      .first("id")) as { id: number } | undefined;
    if (!waiting) return;
    await Promise.all([
      deliverOutbox(appDb(), sender(), now),
      deliverOutbox(appDb(), sender(), now),
    ]);
  }
  throw new Error(`order ${orderId}: its e-mails did not leave`);
}

const mailFor = (orderId: number) =>
  inbox.messages().filter((m) => m.messageId.startsWith(`<order-${orderId}.cosign-`));

async function ledger(orderId: number) {
  return (await appDb()("ledger_entries")
    .where({ entity_type: "order", entity_id: String(orderId) })
    .orderBy("id")
    .select("action", "after_json", "actor_role")) as {
    action: string;
    after_json: string;
    actor_role: string;
  }[];
}

describe("co-sign reminders", () => {
  it("reminds the prescriber each interval and escalates to the designated co-signer at the deadline, each e-mail once", async () => {
    const t0 = new Date(Date.now() - 1000);
    const { order, prescriber, designated, unitId } = await waitingOrder(t0);
    const at = (ms: number) => new Date(t0.getTime() + ms);
    const sweepTwice = async (ms: number) => {
      // Two workers at the same moment: one takes the step, the other finds it taken.
      const passes = await Promise.all([
        remindCosigns(appDb(), at(ms), cfg, { unitIds: [unitId] }),
        remindCosigns(appDb(), at(ms), cfg, { unitIds: [unitId] }),
      ]);
      await deliverFor(order.id, at(ms));
      return passes;
    };

    await sweepTwice(59 * MIN);
    expect(mailFor(order.id)).toHaveLength(0);

    const first = await sweepTwice(61 * MIN);
    expect(first.map((p) => p.reminded).sort()).toEqual([0, 1]);
    await sweepTwice(62 * MIN);
    let mail = mailFor(order.id);
    expect(mail.map((m) => m.messageId)).toEqual([
      `<order-${order.id}.cosign-remind-1.${prescriber.id}@kestrel.example>`,
    ]);
    expect(mail[0]!.to).toEqual([prescriber.email]);
    expect(mail[0]!.subject).toMatch(/Co-sign reminder: telephone order #\d+ waiting 1 h 1 min/);

    await sweepTwice(2 * HOUR + MIN);
    // A worker down for hours sends the step due now, not each one it missed.
    await sweepTwice(5 * HOUR + 30 * MIN);
    mail = mailFor(order.id);
    expect(mail.map((m) => m.messageId.split(".")[1])).toEqual([
      "cosign-remind-1",
      "cosign-remind-2",
      "cosign-remind-5",
    ]);

    await sweepTwice(24 * HOUR);
    await sweepTwice(25 * HOUR);
    await sweepTwice(30 * HOUR);
    mail = mailFor(order.id);
    const escalation = mail.filter((m) => m.messageId.includes("cosign-escalate"));
    expect(escalation.map((m) => m.to)).toEqual([[designated.email]]);
    expect(escalation[0]!.subject).toMatch(/Co-sign overdue/);
    expect(escalation[0]!.text).not.toMatch(/Cosignwait|Rosa|CW[0-9A-F]{6}/);
    expect(new Set(mail.map((m) => m.messageId)).size).toBe(mail.length);

    const rows = await ledger(order.id);
    expect(rows.map((r) => r.action)).toEqual([
      "order.verbal",
      "order.cosign_remind",
      "order.cosign_remind",
      "order.cosign_remind",
      "order.cosign_escalate",
    ]);
    expect(rows.slice(1).every((r) => r.actor_role === "system")).toBe(true);
    const escalated = JSON.parse(rows[4]!.after_json) as {
      step: string;
      told: { userId: number; basis: string }[];
    };
    expect(escalated.step).toBe("escalate");
    expect(escalated.told).toEqual([{ userId: designated.id, basis: "designated" }]);
    const notices = (await cosignNotices(appDb(), [order.id])).get(order.id);
    expect(notices?.reminders).toBe(3);
    expect(notices?.escalatedAt).toMatch(/^\d{4}-/);
  });

  it("stops once the order is co-signed", async () => {
    const t0 = new Date(Date.now() - 1000);
    const { order, prescriber, unitId } = await waitingOrder(t0);
    await cosignOrderOperation.invoke(
      appDb(),
      prescriber,
      { orderId: order.id, version: order.version, password: PASSWORD },
      new Date(t0.getTime() + 30 * MIN),
    );
    await remindCosigns(appDb(), new Date(t0.getTime() + 25 * HOUR), cfg, { unitIds: [unitId] });
    expect(mailFor(order.id)).toHaveLength(0);
    expect((await ledger(order.id)).map((r) => r.action)).toEqual(["order.verbal", "order.cosign"]);
  });
});

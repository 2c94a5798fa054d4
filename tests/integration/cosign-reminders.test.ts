import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { runAlertWork } from "@/lib/alerts/worker";
import { hashPassword } from "@/lib/auth/password";
import { alertConfig } from "@/lib/alerts/config";
import { closeDb } from "@/lib/db";
import { startFakeInbox, type FakeInbox } from "@/lib/mail/fake-inbox";
import { createMailTransport } from "@/lib/mail/transport";
import { cosignNotices, remindCosigns } from "@/lib/orders/cosign-reminders";
import { cosignOrderOperation, writeOrderOperation } from "@/lib/orders/operations";
import type { OrderInput } from "@/lib/orders/schema";
import { actorByEmail, admitTestPatient, appDb, SEEDED, uniqueEmail } from "../helpers/db";
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

async function physician(unitId: number, designated = false) {
  const email = uniqueEmail("cosign-dr");
  const [id] = await appDb()("users").insert({
    email,
    name: `Dr Cosign ${email.slice(10, 16)}`,
    role: "physician",
    password_hash: await hashPassword(PASSWORD),
  });
  await appDb()("user_units").insert({ user_id: id, unit_id: unitId });
  if (designated) await appDb()("unit_cosigners").insert({ unit_id: unitId, user_id: id });
  return actorByEmail(email);
}

async function waitingOrder(t0: Date) {
  const { patientId, unitId } = await admitTestPatient();
  const prescriber = await physician(unitId);
  const designated = await physician(unitId, true);
  const nurse = await actorByEmail(SEEDED.nurse);
  const order = await writeOrderOperation.invoke(
    appDb(),
    nurse,
    {
      ...hfncOrder(patientId),
      entryMode: "telephone",
      prescriberId: prescriber.id,
      readBackConfirmed: true,
    } as unknown as OrderInput,
    t0,
  );
  return { order, prescriber, designated, unitId };
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
      await Promise.all([remindCosigns(appDb(), at(ms), cfg), remindCosigns(appDb(), at(ms), cfg)]);
      await runAlertWork(appDb(), sender(), at(ms), alertConfig(), cfg);
    };

    await sweepTwice(59 * MIN);
    expect(mailFor(order.id)).toHaveLength(0);

    await sweepTwice(61 * MIN);
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
    // Every physician the unit designates, other than the prescriber: one e-mail each.
    const designatedIds = (await appDb()("unit_cosigners")
      .where({ unit_id: unitId })
      .pluck("user_id")) as number[];
    expect(designatedIds).toContain(designated.id);
    expect(escalation.map((m) => m.messageId).sort()).toEqual(
      designatedIds.map((id) => `<order-${order.id}.cosign-escalate.${id}@kestrel.example>`).sort(),
    );
    expect(escalation.flatMap((m) => m.to)).toContain(designated.email);
    expect(escalation[0]!.subject).toMatch(/Co-sign overdue/);
    expect(escalation[0]!.text).not.toMatch(/Test Patient|MRN/i);
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
    expect(escalated.told).toContainEqual({ userId: designated.id, basis: "designated" });
    const notices = (await cosignNotices(appDb(), [order.id])).get(order.id);
    expect(notices?.reminders).toBe(3);
    expect(notices?.escalatedAt).toMatch(/^\d{4}-/);
  });

  it("stops once the order is co-signed", async () => {
    const t0 = new Date(Date.now() - 1000);
    const { order, prescriber } = await waitingOrder(t0);
    await cosignOrderOperation.invoke(
      appDb(),
      prescriber,
      { orderId: order.id, version: order.version, password: PASSWORD },
      new Date(t0.getTime() + 30 * MIN),
    );
    await runAlertWork(appDb(), sender(), new Date(t0.getTime() + 25 * HOUR), alertConfig(), cfg);
    expect(mailFor(order.id)).toHaveLength(0);
    expect((await ledger(order.id)).map((r) => r.action)).toEqual(["order.verbal", "order.cosign"]);
  });
});

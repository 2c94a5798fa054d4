import { randomUUID } from "node:crypto";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Actor } from "@/lib/auth/actor";
import { loadActor } from "@/lib/auth/actor-queries";
import { runAlertWork } from "@/lib/alerts/worker";
import { loadBoard } from "@/lib/board/queries";
import { closeDb } from "@/lib/db";
import { readDueSoonOperation } from "@/lib/due-soon/operations";
import { startFakeInbox, type FakeInbox } from "@/lib/mail/fake-inbox";
import { createMailTransport } from "@/lib/mail/transport";
import { readOrderChangeOperation } from "@/lib/order-notices/operations";
import {
  listOrderRequestsOperation,
  replyOrderRequestOperation,
  sendOrderRequestOperation,
} from "@/lib/order-requests/operations";
import { writeOrderOperation } from "@/lib/orders/operations";
import type { OrderInput } from "@/lib/orders/schema";
import { chartReadingOperation } from "@/lib/readings/operations";
import { SEEDED, actorByEmail, admitTestPatient, appDb, uniqueEmail } from "../helpers/db";
import { hfncOrder } from "../helpers/orders";

// The three loops against the real database, the real outbox and the SMTP fake,
// with an injected clock: a request for a new order, the notices of an order
// change, and the reassessments coming due. Every test uses fresh beds and,
// where a count matters, fresh staff, so the seeded shift does not interfere.

const MIN = 60_000;
let inbox: FakeInbox;
let physician: Actor;
let otherUnitPhysician: Actor;
const sender = () => createMailTransport({ host: "127.0.0.1", port: inbox.smtpPort });

beforeAll(async () => {
  inbox = await startFakeInbox({ smtpPort: 0, httpPort: null });
  physician = await actorByEmail(SEEDED.physician);
  otherUnitPhysician = await freshUser("physician", "RESP");
});

afterAll(async () => {
  await inbox.stop();
  await closeDb();
});

/** A new active user of one role on one unit (so nobody else's beds or mail mix in). */
async function freshUser(role: Actor["role"], unit: "MICU" | "RESP" = "MICU"): Promise<Actor> {
  const knex = appDb();
  const [id] = await knex("users").insert({
    email: uniqueEmail(`loops-${role}`),
    name: `Loops ${role} ${randomUUID().slice(0, 4)}`,
    role,
    password_hash: "x",
  });
  const u = (await knex("units").where({ code: unit }).first("id")) as { id: number };
  await knex("user_units").insert({ user_id: Number(id), unit_id: u.id });
  return loadActor(knex, Number(id));
}

type Team = { nurse: Actor; therapist: Actor; physician?: Actor };

/** A fresh bed and patient with this team assigned from two hours ago to twelve hours on. */
async function bedWith(team: Team, t0: Date) {
  const admitted = await admitTestPatient("MICU");
  const duties = [
    ["nurse", team.nurse],
    ["therapist", team.therapist],
    ...(team.physician ? [["physician", team.physician] as const] : []),
  ] as const;
  await appDb()("care_assignments").insert(
    duties.map(([duty, user]) => ({
      bed_id: admitted.bedId,
      user_id: user.id,
      duty,
      starts_at: new Date(t0.getTime() - 120 * MIN),
      ends_at: new Date(t0.getTime() + 720 * MIN),
    })),
  );
  return admitted;
}

async function order(patientId: number, at: Date, overrides: Partial<OrderInput> = {}) {
  return writeOrderOperation.invoke(appDb(), physician, hfncOrder(patientId, overrides), at);
}

const mailTo = (email: string, idPart: string) =>
  inbox.messages().filter((m) => m.to.includes(email) && m.messageId.includes(idPart));

async function ledger(entityType: string, id: number): Promise<string[]> {
  return (await appDb()("ledger_entries")
    .where({ entity_type: entityType, entity_id: String(id) })
    .orderBy("id")
    .pluck("action")) as string[];
}

/** The steps a person or a sweep took, without the e-mail deliveries between them. */
const steps = (actions: string[]) => actions.filter((a) => a !== "order_request.notify");

describe("a request for a new order", () => {
  it("reaches the shift's physician by e-mail once, escalates unanswered, and closes with the signed order", async () => {
    const t0 = new Date(Date.now() - 60 * MIN);
    const team = {
      nurse: await freshUser("nurse"),
      therapist: await freshUser("therapist"),
      physician: await freshUser("physician"),
    };
    const { patientId } = await bedWith(team, t0);
    const first = await order(patientId, t0);
    await chartReadingOperation.invoke(
      appDb(),
      team.nurse,
      { patientId, takenAt: t0.toISOString(), spo2: 89, device: "hfnc", fio2: 0.4, flow: 40 },
      new Date(t0.getTime() + MIN),
    );
    const asked = new Date(t0.getTime() + 2 * MIN);
    const body = {
      patientId,
      source: "limit_refusal",
      need: "FiO2 up to 0.80 on high flow",
      reason: "SpO2 89 % at the order's FiO2 maximum",
      device: "hfnc",
      fio2Max: 0.8,
      idempotencyKey: `loops-${randomUUID()}`,
    };
    const request = await sendOrderRequestOperation.invoke(appDb(), team.therapist, body, asked);
    expect(request).toMatchObject({
      state: "open",
      physician: { id: team.physician.id },
      recipientBasis: "assigned",
      requestedBy: { id: team.therapist.id },
      proposal: { device: "hfnc", fio2Max: 0.8 },
    });
    // The current settings and the latest SpO2 travel with it.
    expect(request.snapshot.settings).toMatchObject({ device: "hfnc", fio2: 0.4, flow: 40 });
    expect(request.snapshot.latestSpo2?.pct).toBe(89);
    expect(request.snapshot.order?.id).toBe(first.id);
    // A repeated submission (same key) is the same request.
    const again = await sendOrderRequestOperation.invoke(appDb(), team.therapist, body, asked);
    expect(again.id).toBe(request.id);
    // A second, different ask while one is open is refused.
    await expect(
      sendOrderRequestOperation.invoke(
        appDb(),
        team.nurse,
        { ...body, idempotencyKey: undefined, source: "chart" },
        asked,
      ),
    ).rejects.toMatchObject({ status: 409 });

    await runAlertWork(appDb(), sender(), new Date(asked.getTime() + MIN));
    await runAlertWork(appDb(), sender(), new Date(asked.getTime() + 2 * MIN));
    const asks = mailTo(team.physician.email, `order-request-${request.id}.ask.`);
    expect(asks).toHaveLength(1);
    expect(asks[0]!.subject).toContain("New order requested");
    expect(asks[0]!.text).toContain("FiO2 up to 0.80 on high flow");
    expect(asks[0]!.text).toContain("latest SpO2 89 %");
    // The physician's queue holds it, addressed to them.
    const queue = await listOrderRequestsOperation.invoke(appDb(), team.physician, {});
    expect(queue.find((r) => r.id === request.id)).toMatchObject({ forMe: true, state: "open" });

    // Not escalated before the setting's 15 minutes, escalated once after.
    await runAlertWork(appDb(), sender(), new Date(asked.getTime() + 14 * MIN));
    expect(mailTo(team.physician.email, `order-request-${request.id}.escalate.`)).toHaveLength(0);
    await runAlertWork(appDb(), sender(), new Date(asked.getTime() + 16 * MIN));
    await runAlertWork(appDb(), sender(), new Date(asked.getTime() + 40 * MIN));
    const escalated = (
      await listOrderRequestsOperation.invoke(appDb(), team.physician, {
        requestId: String(request.id),
      })
    )[0]!;
    expect(escalated.state).toBe("escalated");
    expect(escalated.told).toHaveLength(2);
    expect(mailTo(team.physician.email, `order-request-${request.id}.escalate.`)).toHaveLength(1);
    expect(steps(await ledger("order_request", request.id))).toEqual([
      "order_request.send",
      "order_request.escalate",
    ]);
    // Each e-mail the relay accepted is a "notified" step of its own.
    const sent = await appDb()("mail_outbox")
      .where({ order_request_id: request.id, state: "sent" })
      .count({ n: "*" });
    expect(
      (await ledger("order_request", request.id)).filter((a) => a.endsWith(".notify")),
    ).toHaveLength(Number(sent[0]!.n));
    expect(Number(sent[0]!.n)).toBeGreaterThanOrEqual(2);

    // The new order, signed, closes it in its own transaction.
    const signed = await order(patientId, new Date(asked.getTime() + 41 * MIN), {
      supersedesOrderId: first.id,
      fio2Max: 0.8,
    });
    const closed = (
      await listOrderRequestsOperation.invoke(appDb(), team.therapist, {
        requestId: String(request.id),
        status: "all",
      })
    )[0]!;
    expect(closed).toMatchObject({ state: "closed", closedHow: "order", closedOrderId: signed.id });
    expect(steps(await ledger("order_request", request.id))).toEqual([
      "order_request.send",
      "order_request.escalate",
      "order_request.close",
    ]);
    await runAlertWork(appDb(), sender(), new Date(asked.getTime() + 42 * MIN));
    expect(mailTo(team.therapist.email, `order-request-${request.id}.closed.`)).toHaveLength(1);
  });

  it("goes to the order's prescriber when no physician is assigned, and closes with a reply", async () => {
    const t0 = new Date();
    const team = { nurse: await freshUser("nurse"), therapist: await freshUser("therapist") };
    const { patientId } = await bedWith(team, t0);
    await order(patientId, t0);
    const request = await sendOrderRequestOperation.invoke(
      appDb(),
      team.nurse,
      { patientId, source: "chart", need: "A lower target band", reason: "Known CO2 retainer" },
      t0,
    );
    expect(request).toMatchObject({
      physician: { id: physician.id },
      recipientBasis: "prescriber",
    });
    // Another unit's physician cannot see it; a nurse cannot answer it.
    await expect(
      replyOrderRequestOperation.invoke(appDb(), otherUnitPhysician, {
        requestId: request.id,
        reply: "Not mine",
      }),
    ).rejects.toMatchObject({ status: 404 });
    await expect(
      replyOrderRequestOperation.invoke(appDb(), team.nurse, {
        requestId: request.id,
        reply: "Not allowed",
      }),
    ).rejects.toMatchObject({ status: 403 });
    const answered = await replyOrderRequestOperation.invoke(
      appDb(),
      physician,
      { requestId: request.id, reply: "Keep 92–96 % until the gas at noon." },
      new Date(t0.getTime() + MIN),
    );
    expect(answered).toMatchObject({ state: "closed", closedHow: "reply" });
    expect(answered.closedWords).toContain("Keep 92–96 % until the gas at noon.");
    await expect(
      replyOrderRequestOperation.invoke(appDb(), physician, {
        requestId: request.id,
        reply: "Twice",
      }),
    ).rejects.toMatchObject({ status: 409 });
    // Answered before the worker ran: the ask is not sent as if still open.
    const rows = (await appDb()("mail_outbox")
      .where({ order_request_id: request.id })
      .orderBy("id")
      .select("purpose", "state")) as { purpose: string; state: string }[];
    expect(rows).toEqual([
      { purpose: "order_request", state: "cancelled" },
      { purpose: "order_request_closed", state: "pending" },
    ]);
    expect(await ledger("order_request", request.id)).toEqual([
      "order_request.send",
      "order_request.reply",
    ]);
  });
});

describe("an order change", () => {
  it("notifies the bed's nurse and therapist exactly once each, and the read is a ledger row", async () => {
    const t0 = new Date(Date.now() - 30 * MIN);
    const team = { nurse: await freshUser("nurse"), therapist: await freshUser("therapist") };
    const { patientId, unitId } = await bedWith(team, t0);
    const first = await order(patientId, t0);
    const key = `loops-${randomUUID()}`;
    const change = hfncOrder(patientId, {
      supersedesOrderId: first.id,
      fio2Max: 0.8,
      spo2Lower: 88,
      spo2Upper: 92,
      idempotencyKey: key,
    });
    const at = new Date(t0.getTime() + 5 * MIN);
    const second = await writeOrderOperation.invoke(appDb(), physician, change, at);
    // The same write sent again (a retry) replays: no second order, no second notice.
    const replay = await writeOrderOperation.invoke(appDb(), physician, change, at);
    expect(replay.id).toBe(second.id);
    const notices = (await appDb()("order_notices")
      .where({ order_id: second.id })
      .orderBy("duty")
      .select("user_id", "duty", "event", "words", "read_at")) as {
      user_id: number;
      duty: string;
      event: string;
      words: string;
      read_at: Date | null;
    }[];
    expect(notices.map((n) => [n.user_id, n.duty, n.event])).toEqual([
      [team.nurse.id, "nurse", "supersede"],
      [team.therapist.id, "therapist", "supersede"],
    ]);
    expect(notices[0]!.words).toBe(
      `Order #${second.id} replaces #${first.id}: band target SpO2 92–96 % → target SpO2 88–92 %; FiO2 limits FiO2 0.30–0.60 → FiO2 0.30–0.80.`,
    );
    await runAlertWork(appDb(), sender(), new Date(at.getTime() + MIN));
    await runAlertWork(appDb(), sender(), new Date(at.getTime() + 2 * MIN));
    for (const person of [team.nurse, team.therapist])
      expect(mailTo(person.email, `order-${second.id}.supersede.`)).toHaveLength(1);

    // The Board marks the bed until the nurse has read it.
    const marked = async () =>
      (await loadBoard(appDb(), [unitId], at)).beds.find((b) => b.patientId === patientId)!
        .orderUnread;
    expect(await marked()).toBe(true);
    const read = await readOrderChangeOperation.invoke(appDb(), team.nurse, { orderId: second.id });
    expect(read.marked).toBe(1);
    expect(await marked()).toBe(false);
    const twice = await readOrderChangeOperation.invoke(appDb(), team.nurse, {
      orderId: second.id,
    });
    expect(twice.marked).toBe(0);
    expect((await ledger("order", second.id)).filter((a) => a === "order.read")).toHaveLength(1);
    await expect(
      readOrderChangeOperation.invoke(appDb(), otherUnitPhysician, { orderId: second.id }),
    ).rejects.toMatchObject({ status: 404 });
  });
});

describe("reassessments coming due", () => {
  it("lists exactly the caller's beds due within the next 60 minutes, not the overdue ones", async () => {
    const t0 = new Date(Date.now() - 5 * MIN);
    const team = { nurse: await freshUser("nurse"), therapist: await freshUser("therapist") };
    const beds = [];
    for (const reassessMinutes of [30, 45, 120]) {
      const { patientId } = await bedWith(team, t0);
      await order(patientId, t0, { reassessMinutes });
      beds.push(patientId);
    }
    const [in30, in45, in120] = beds as [number, number, number];
    const dueAt = async (who: Actor, minutes: number) =>
      (
        await readDueSoonOperation.invoke(appDb(), who, {}, new Date(t0.getTime() + minutes * MIN))
      ).beds.map((b) => [b.patientId, b.minutesLeft]);
    expect(await dueAt(team.nurse, 10)).toEqual([
      [in30, 20],
      [in45, 35],
    ]);
    // The therapist of the same beds sees the same list.
    expect(await dueAt(team.therapist, 10)).toEqual([
      [in30, 20],
      [in45, 35],
    ]);
    // At 61 min the first two are overdue (the sweep's business); the third is due in 59.
    expect(await dueAt(team.nurse, 61)).toEqual([[in120, 59]]);
    // Exactly at the due time it is still listed, with no minutes left.
    expect(await dueAt(team.nurse, 30)).toEqual([
      [in30, 0],
      [in45, 15],
    ]);
    const stranger = await freshUser("nurse");
    expect(await dueAt(stranger, 10)).toEqual([]);
  });
});

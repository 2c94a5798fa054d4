import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { seed as seedDemo } from "@/db/seeds/01-demo";
import { rollAssignments } from "@/lib/assignments/roll";
import { deliverOutbox } from "@/lib/alerts/outbox";
import { listAlerts } from "@/lib/alerts/queries";
import { loadActor } from "@/lib/auth/actor-queries";
import { closeDb } from "@/lib/db";
import { startFakeInbox, type FakeInbox } from "@/lib/mail/fake-inbox";
import { createMailTransport } from "@/lib/mail/transport";
import { writeOrderOperation } from "@/lib/orders/operations";
import { chartReadingOperation } from "@/lib/readings/operations";
import { hfncOrder } from "../helpers/orders";
import { scratchDb, type ScratchDb } from "../helpers/scratch-db";

// The demo database a day and a half old: seeded with the clock 30 hours back
// (its assignments cover the shifts around that time only), then started
// again — the start rolls the assignments forward, and an alert today reaches
// the nurse assigned to the bed now, not nobody.

let scratch: ScratchDb;
let inbox: FakeInbox;
const NOW = new Date();

beforeAll(async () => {
  scratch = await scratchDb("demo_roll");
  await scratch.migrate();
  inbox = await startFakeInbox({ smtpPort: 0, httpPort: null });
  vi.useFakeTimers({ toFake: ["Date"] });
  vi.setSystemTime(new Date(NOW.getTime() - 30 * 3600_000));
  try {
    await seedDemo(scratch.app);
  } finally {
    vi.useRealTimers();
  }
}, 120_000);

afterAll(async () => {
  await inbox?.stop();
  await scratch?.drop();
  await closeDb();
});

const idOf = async (email: string) =>
  ((await scratch.app("users").where({ email }).first("id")) as { id: number }).id;

describe("a demo database seeded a day and a half earlier", () => {
  it("has nobody on shift until the start rolls the assignments forward; then an alert e-mails the bed's nurse", async () => {
    const knex = scratch.app;
    const bed = (await knex("beds as b")
      .join("admissions as a", "a.bed_id", "b.id")
      .where("b.label", "I01")
      .whereNull("a.discharged_at")
      .first("b.id", "a.patient_id")) as { id: number; patient_id: number };
    const nurseNow = () =>
      knex("care_assignments as c")
        .join("users as u", "u.id", "c.user_id")
        .where({ "c.bed_id": bed.id, "c.duty": "nurse" })
        .where("c.starts_at", "<=", NOW)
        .where("c.ends_at", ">", NOW)
        .first("u.id", "u.email") as Promise<{ id: number; email: string } | undefined>;
    expect(await nurseNow()).toBeUndefined();

    const rolled = await rollAssignments(knex, NOW);
    expect(rolled.map((r) => r.unitId).length).toBeGreaterThanOrEqual(2);
    const nurse = await nurseNow();
    expect(nurse?.email).toMatch(/@kestrel\.example$/);

    const physician = await loadActor(knex, await idOf("tobias.renwick@kestrel.example"));
    const therapist = await loadActor(knex, await idOf("jonah.pell@kestrel.example"));
    await writeOrderOperation.invoke(knex, physician, hfncOrder(bed.patient_id), NOW);
    await chartReadingOperation.invoke(
      knex,
      therapist,
      {
        patientId: bed.patient_id,
        takenAt: NOW.toISOString(),
        spo2: 86,
        device: "hfnc",
        fio2: 0.4,
        flow: 40,
      },
      NOW,
    );
    const [alert] = await listAlerts(knex, therapist, {
      patientId: bed.patient_id,
      status: "open",
    });
    expect(alert!.detail.told).toMatchObject({ level: 0, recipients: [{ basis: "assigned" }] });
    await deliverOutbox(
      knex,
      createMailTransport({ host: "127.0.0.1", port: inbox.smtpPort }),
      new Date(NOW.getTime() + 1000),
    );
    const mails = inbox
      .messages()
      .filter((m) => m.headers["x-tidemark-alert"] === String(alert!.id));
    expect(mails.map((m) => m.to[0])).toEqual([nurse!.email]);
  });
});

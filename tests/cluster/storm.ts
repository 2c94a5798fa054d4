/**
 * An alert storm while one alert worker is killed (-9) and the SMTP relay is
 * down for 30 s: every e-mail the outbox sent arrives, and none arrives twice
 * (counted by Message-ID in the SMTP fake).
 */
import { randomUUID } from "node:crypto";
import { appDb } from "../helpers/db";
import type { Session } from "../helpers/http";
import { part, sleep, until } from "./control";
import type { Mailbox } from "./faults";
import { outcome, type Outcome } from "./outcome";
import { signIn } from "./setup";

const SMTP_DOWN_MS = 30_000;

type Target = {
  patient_id: number;
  device: string;
  spo2_lower_pct: number;
  initial_fio2: number | null;
  initial_flow_l_min: number | null;
};

async function chartLow(sessions: Session[], t: Target): Promise<boolean> {
  for (const s of sessions) {
    const res = await s.json("/api/v1/readings", "POST", {
      patientId: t.patient_id,
      takenAt: new Date().toISOString(),
      spo2: Math.max(70, t.spo2_lower_pct - 8),
      device: t.device,
      // The device's own settings, as the order started it (flow for cannulae, FiO2 for masks…).
      ...(t.initial_flow_l_min === null ? {} : { flow: Number(t.initial_flow_l_min) }),
      ...(t.initial_fio2 === null ? {} : { fio2: Number(t.initial_fio2) }),
      idempotencyKey: randomUUID(),
    });
    const text = await res.text();
    if (res.status === 201) return true;
    if (res.status !== 403 && res.status !== 404) {
      console.log(`   patient ${t.patient_id} (${t.device}): ${res.status} ${text.slice(0, 200)}`);
    }
  }
  return false;
}

export async function storm(mailbox: Mailbox): Promise<Outcome[]> {
  const sessions = [await signIn("nurse"), await signIn("therapist"), await signIn("physician")];
  // Seeded patients on an active order whose bed has someone assigned now: their alerts are mailed.
  const [targets] = (await appDb().raw(
    `SELECT o.patient_id, o.device, o.spo2_lower_pct, o.initial_fio2, o.initial_flow_l_min FROM orders o
       JOIN admissions a ON a.id = o.admission_id AND a.discharged_at IS NULL
      WHERE o.status = 'active' AND EXISTS (SELECT 1 FROM care_assignments c
        WHERE c.bed_id = a.bed_id AND c.starts_at <= UTC_TIMESTAMP() AND c.ends_at > UTC_TIMESTAMP())`,
  )) as [Target[]];
  const before = Number(
    ((await appDb()("mail_outbox").max({ id: "id" }).first()) as { id: number | null }).id ?? 0,
  );

  await mailbox.stop();
  const t0 = Date.now();
  console.log(`   SMTP down; charting a low SpO2 for ${targets.length} patients`);
  const charted = (await Promise.all(targets.map((t) => chartLow(sessions, t)))).filter(Boolean);
  await sleep(Math.max(0, t0 + 5000 - Date.now()));
  await part("worker-kill", 1);
  console.log(`   worker 1 killed at ${Math.round((Date.now() - t0) / 1000)} s`);
  await sleep(Math.max(0, t0 + SMTP_DOWN_MS - Date.now()));
  await mailbox.start();
  console.log(`   SMTP back at ${Math.round((Date.now() - t0) / 1000)} s`);
  await sleep(5000);
  await part("worker-start", 1);

  const drained = await until(
    async () => {
      const pending = (await appDb()("mail_outbox")
        .where("id", ">", before)
        .where({ state: "pending" })
        .count({ n: "*" })
        .first()) as { n: number };
      return Number(pending.n) === 0;
    },
    300_000,
    1000,
  );
  console.log(`   outbox drained at ${Math.round((Date.now() - t0) / 1000)} s`);

  const sent = (await appDb()("mail_outbox")
    .where("id", ">", before)
    .where({ state: "sent" })
    .pluck("message_id")) as string[];
  const received = new Map<string, number>();
  for (const m of mailbox.all()) received.set(m.messageId, (received.get(m.messageId) ?? 0) + 1);
  const missing = sent.filter((id) => !received.has(id));
  const twice = [...received].filter(([, n]) => n > 1);
  return [
    outcome(
      "the storm raised alerts that were mailed",
      charted.length > 5 && sent.length > 5,
      `${charted.length} low readings charted; ${sent.length} e-mails sent by the outbox`,
    ),
    outcome(
      "the outbox drained after SMTP came back",
      drained,
      drained ? undefined : "rows still pending after 300 s",
    ),
    outcome(
      "every sent e-mail arrived",
      missing.length === 0,
      missing.length
        ? `missing: ${missing.slice(0, 5).join(", ")}`
        : `${sent.length} of ${sent.length}`,
    ),
    outcome(
      "no e-mail arrived twice (by Message-ID, the whole run)",
      twice.length === 0,
      twice.length
        ? twice
            .map(([id, n]) => `${id} × ${n}`)
            .slice(0, 5)
            .join(", ")
        : `${received.size} distinct Message-IDs received`,
    ),
  ];
}

/**
 * Writers for the cluster tests: clinicians' writes through the load balancer,
 * each with its own patient so the only conflicts are the cluster's own. A write
 * whose answer was lost (a killed node or app server) is sent again with the
 * same idempotency key until it gets an answer, so every write ends either
 * acknowledged or refused — and the tests can count rows exactly.
 */
import { randomUUID } from "node:crypto";
import { BASE_URL } from "../helpers/browser";
import { type Session } from "../helpers/http";
import { hfncOrder } from "../helpers/orders";
import { sleep } from "./control";

export type Kind = "order" | "adjustment" | "reading" | "import";
export type Ack = { kind: Kind; id: number; patientId: number; at: number };

export type WriterStats = { sent: number; resent: number; refused: string[] };

const ANSWER_LIMIT_MS = 60_000;
export const ROWS_PER_UPLOAD = 30;

/**
 * Sends until the server answers with anything but 5xx (or a lost connection);
 * a 5xx or a lost answer means "not known whether it landed": send it again.
 */
export async function settle(
  send: () => Promise<Response>,
  stats: WriterStats,
): Promise<{ status: number; body: unknown }> {
  const end = Date.now() + ANSWER_LIMIT_MS;
  for (let attempt = 0; ; attempt += 1) {
    if (attempt > 0) stats.resent += 1;
    try {
      const res = await send();
      if (res.status < 500) {
        stats.sent += 1;
        return { status: res.status, body: await res.json().catch(() => null) };
      }
      await res.body?.cancel();
    } catch {
      // Connection reset or refused: the answer was lost.
    }
    if (Date.now() > end) throw new Error("no answer from the cluster for 60 s");
    await sleep(Math.min(2000, 100 * 2 ** attempt));
  }
}

export type Writer = {
  kind: Kind;
  patientId: number;
  stats: WriterStats;
  /** Writes once; returns the acknowledged row, or null when refused (kept in stats). */
  step(): Promise<Ack | null>;
};

type Patient = { patientId: number; mrn: string; bed: string };

export function orderWriter(session: Session, p: Patient, firstOrderId: number): Writer {
  const stats: WriterStats = { sent: 0, resent: 0, refused: [] };
  let current = firstOrderId;
  let i = 0;
  return {
    kind: "order",
    patientId: p.patientId,
    stats,
    async step() {
      i += 1;
      const body = {
        ...hfncOrder(p.patientId, {
          supersedesOrderId: current,
          spo2Lower: i % 2 ? 90 : 92,
          rationale: `Cluster test order ${i}`,
        }),
        idempotencyKey: randomUUID(),
      };
      const res = await settle(() => session.json("/api/v1/orders", "POST", body), stats);
      if (res.status !== 201 && res.status !== 200) {
        stats.refused.push(`${res.status} ${JSON.stringify(res.body).slice(0, 200)}`);
        return null;
      }
      current = (res.body as { order: { id: number } }).order.id;
      return { kind: "order", id: current, patientId: p.patientId, at: Date.now() };
    },
  };
}

export function adjustmentWriter(session: Session, p: Patient, version: number): Writer {
  const stats: WriterStats = { sent: 0, resent: 0, refused: [] };
  let settingsVersion = version;
  let i = 0;
  return {
    kind: "adjustment",
    patientId: p.patientId,
    stats,
    async step() {
      i += 1;
      const body = {
        patientId: p.patientId,
        settingsVersion,
        toFio2: i % 2 ? 0.45 : 0.4,
        toFlow: 40,
        reason: "wean",
        rationale: `Cluster test adjustment ${i}`,
        appliedAt: new Date().toISOString(),
        idempotencyKey: randomUUID(),
      };
      const res = await settle(() => session.json("/api/v1/adjustments", "POST", body), stats);
      if (res.status !== 201 && res.status !== 200) {
        stats.refused.push(`${res.status} ${JSON.stringify(res.body).slice(0, 200)}`);
        return null;
      }
      const adjustment = (res.body as { adjustment: { id: number; settingsVersion: number } })
        .adjustment;
      settingsVersion = adjustment.settingsVersion;
      return { kind: "adjustment", id: adjustment.id, patientId: p.patientId, at: Date.now() };
    },
  };
}

export function readingWriter(session: Session, p: Patient): Writer {
  const stats: WriterStats = { sent: 0, resent: 0, refused: [] };
  return {
    kind: "reading",
    patientId: p.patientId,
    stats,
    async step() {
      const body = {
        patientId: p.patientId,
        takenAt: new Date().toISOString(),
        spo2: 94,
        device: "hfnc",
        fio2: 0.4,
        flow: 40,
        idempotencyKey: randomUUID(),
      };
      const res = await settle(() => session.json("/api/v1/readings", "POST", body), stats);
      if (res.status !== 201 && res.status !== 200) {
        stats.refused.push(`${res.status} ${JSON.stringify(res.body).slice(0, 200)}`);
        return null;
      }
      const id = (res.body as { reading: { id: number } }).reading.id;
      return { kind: "reading", id, patientId: p.patientId, at: Date.now() };
    },
  };
}

/** Half a minute of 1 Hz SpO2 per upload; the same file again answers with the first import. */
export function importWriter(token: string, p: Patient): Writer {
  const stats: WriterStats = { sent: 0, resent: 0, refused: [] };
  let upload = 0;
  let lastPost = 0;
  // After the admission (an hour ago), and never in the future within a run.
  const start = Date.now() - 50 * 60_000;
  return {
    kind: "import",
    patientId: p.patientId,
    stats,
    async step() {
      // A monitor gateway posts about once a second; faster would run past "now".
      await sleep(Math.max(0, lastPost + 1000 - Date.now()));
      lastPost = Date.now();
      const lines = ["time,spo2,pulse_rate"];
      for (let s = 0; s < ROWS_PER_UPLOAD; s++) {
        const t = start + (upload * ROWS_PER_UPLOAD + s) * 1000;
        lines.push(`${new Date(t).toISOString()},${93 + (s % 3)},${80 + (s % 5)}`);
      }
      upload += 1;
      const body = `${lines.join("\n")}\n`;
      const path = `/api/v1/imports/monitor?mrn=${encodeURIComponent(p.mrn)}&bed=${encodeURIComponent(p.bed)}`;
      const res = await settle(
        () =>
          fetch(`${BASE_URL}${path}`, {
            method: "POST",
            headers: { authorization: `Bearer ${token}`, "content-type": "text/csv" },
            body,
          }),
        stats,
      );
      if (res.status !== 201 && res.status !== 200) {
        stats.refused.push(`${res.status} ${JSON.stringify(res.body).slice(0, 200)}`);
        return null;
      }
      const id = (res.body as { import: { id: number } }).import.id;
      return { kind: "import", id, patientId: p.patientId, at: Date.now() };
    },
  };
}

/** Runs every writer in a loop until `stopAt`; collects the acknowledged rows. */
export async function drive(writers: Writer[], stopAt: number, acks: Ack[]): Promise<void> {
  await Promise.all(
    writers.map(async (w) => {
      while (Date.now() < stopAt) {
        const ack = await w.step();
        if (ack) acks.push(ack);
      }
    }),
  );
}

/**
 * One server against the 3-node cluster, through the same HTTP API: hash-chained
 * adjustment writes per second (8 writers, each on a patient of its own, for
 * SECONDS) and the Board's latency (200 requests one after another). Run on
 * demand with both apps up — `npm run demo` on PORT=3001 and `npm run cluster`
 * on 3000 — as `npm run bench:cluster`. Each app's database is reached directly
 * only to admit the benchmark's invented patients.
 *
 *   BENCH_SINGLE=http://localhost:3001,3399,tidemark
 *   BENCH_CLUSTER=http://localhost:3000,3410,tidemark_cluster
 */
import "../../lib/local-env";
import { randomUUID } from "node:crypto";
import knex from "knex";
import { connectionConfig } from "../../lib/db";
import { Session } from "../helpers/http";
import { hfncOrder } from "../helpers/orders";
import { quantile } from "./http-timing";

const WRITERS = 8;
const SECONDS = Number(process.env.SECONDS ?? 20);

type Target = { label: string; url: string; port: number; database: string };

function target(label: string, spec: string): Target {
  const [url, port, database] = spec.split(",");
  return { label, url: url!, port: Number(port), database: database! };
}

async function admit(t: Target, unitId: number): Promise<number> {
  const k = knex({
    client: "mysql2",
    connection: { ...connectionConfig("app", t.database), port: t.port },
    pool: { min: 0, max: 1 },
  });
  try {
    const tag = randomUUID().slice(0, 8);
    const [bedId] = await k("beds").insert({ unit_id: unitId, label: `B${tag}`, sort_order: 950 });
    const [patientId] = await k("patients").insert({
      mrn: `BEN${tag}`,
      family_name: "Benchmark",
      given_name: "Ada",
      birth_date: "1958-03-02",
      sex: "female",
      height_cm: 168,
    });
    await k("admissions").insert({ patient_id: patientId, bed_id: bedId, admitted_at: new Date() });
    return Number(patientId);
  } finally {
    await k.destroy();
  }
}

async function measure(t: Target): Promise<string> {
  const physician = await Session.signIn("ines.varga@kestrel.example", undefined, t.url);
  const units = (await (await physician.fetch("/api/v1/units")).json()) as {
    units: { id: number; code: string }[];
  };
  const micu = units.units.find((u) => u.code === "MICU")!;

  const writers = await Promise.all(
    Array.from({ length: WRITERS }, async () => {
      const patientId = await admit(t, micu.id);
      const res = await physician.json("/api/v1/orders", "POST", {
        ...hfncOrder(patientId, { rationale: "Benchmark patient" }),
        idempotencyKey: randomUUID(),
      });
      if (res.status !== 201) throw new Error(`order: ${res.status} ${await res.text()}`);
      const bedside = (await (
        await physician.fetch(`/api/v1/patients/${patientId}/bedside`)
      ).json()) as { settings: { version: number } };
      const session = await Session.signIn("jonah.pell@kestrel.example", undefined, t.url);
      return { patientId, version: bedside.settings.version, session };
    }),
  );

  let done = 0;
  let conflicts = 0;
  const until = Date.now() + SECONDS * 1000;
  const start = performance.now();
  await Promise.all(
    writers.map(async (w) => {
      for (let i = 0; Date.now() < until; i++) {
        const res = await w.session.json("/api/v1/adjustments", "POST", {
          patientId: w.patientId,
          settingsVersion: w.version,
          toFio2: i % 2 ? 0.45 : 0.4,
          toFlow: 40,
          reason: "wean",
          rationale: "Benchmark adjustment",
          appliedAt: new Date().toISOString(),
          idempotencyKey: randomUUID(),
        });
        const body = (await res.json()) as { adjustment?: { settingsVersion: number } };
        if (res.status === 201 && body.adjustment) {
          w.version = body.adjustment.settingsVersion;
          done++;
        } else conflicts++;
      }
    }),
  );
  const rate = done / ((performance.now() - start) / 1000);

  const board: number[] = [];
  for (let i = 0; i < 210; i++) {
    const t0 = performance.now();
    const res = await physician.fetch(`/api/v1/board?unitId=${micu.id}`);
    await res.arrayBuffer();
    if (i >= 10) board.push(performance.now() - t0); // the first ten warm up
  }
  board.sort((a, b) => a - b);
  return (
    `${t.label.padEnd(8)} adjustments ${rate.toFixed(0).padStart(4)}/s (${done} in ${SECONDS} s, ${WRITERS} writers, ${conflicts} refused); ` +
    `Board median ${quantile(board, 0.5).toFixed(1)} ms, p95 ${quantile(board, 0.95).toFixed(1)} ms`
  );
}

async function main(): Promise<void> {
  const targets = [
    target("single", process.env.BENCH_SINGLE ?? "http://localhost:3001,3399,tidemark"),
    target("cluster", process.env.BENCH_CLUSTER ?? "http://localhost:3000,3410,tidemark_cluster"),
  ];
  for (const t of targets) console.log(await measure(t));
}

void main();

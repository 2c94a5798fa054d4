import { quantile } from "./http-timing";
import { Session } from "../helpers/http";
import { BASE_URL } from "../helpers/browser";
import type { RehearsalView } from "../../lib/rehearsal/views";

/**
 * A rehearsal on a running app (`npm run demo`, or `next start` on a demo
 * database): a physician asks for PATIENTS (default 100) × 72 h, and while the
 * worker thread runs it, the Board API is read one request after another.
 * Prints the Board's latency idle and during the run, and the run's time.
 * E2E_BASE_URL (or E2E_PORT) points at the app.
 */
async function main(): Promise<void> {
  const patients = Number(process.env.PATIENTS ?? 100);
  const physician = await Session.signIn("ines.varga@kestrel.example");
  const micu = (
    (await (await physician.fetch("/api/v1/units")).json()) as {
      units: { id: number; code: string }[];
    }
  ).units.find((u) => u.code === "MICU")!;
  const tables = (
    (await (await physician.fetch("/api/v1/step-tables")).json()) as {
      stepTables: { id: number; code: string }[];
    }
  ).stepTables;
  const lower = tables.find((t) => t.code === "ardsnet-lower-peep")!;

  async function boardMs(): Promise<number> {
    const start = performance.now();
    const res = await physician.fetch(`/api/v1/board?unitId=${micu.id}`);
    await res.arrayBuffer();
    if (res.status !== 200) throw new Error(`Board answered ${res.status}`);
    return performance.now() - start;
  }
  const summary = (ms: number[]) => {
    const s = [...ms].sort((a, b) => a - b);
    return `n ${s.length}, median ${quantile(s, 0.5).toFixed(1)} ms, p95 ${quantile(s, 0.95).toFixed(1)} ms, max ${s.at(-1)!.toFixed(1)} ms`;
  };

  for (let i = 0; i < 5; i++) await boardMs(); // warm up
  const idle: number[] = [];
  for (let i = 0; i < 100; i++) idle.push(await boardMs());

  const body = {
    unitId: micu.id,
    label: `Bench ${patients} × 72 h`,
    ventilatedTableId: lower.id,
    spo2Lower: 92,
    spo2Upper: 96,
    ventilatedFio2Min: 0.3,
    ventilatedFio2Max: 1,
    peepMin: 5,
    peepMax: 18,
    hfncFio2Min: 0.21,
    hfncFio2Max: 0.8,
    sustainSeconds: 60,
    sustainSharePct: 80,
    urgentBelowPct: 85,
    urgentSustainSeconds: 15,
    escalateAfterMinutes: 10,
    nurseResponseMinutes: 4,
    therapistMinutes: 5,
    checkEveryMinutes: 60,
    patients,
    hours: 72,
    seed: 1,
  };
  const asked = performance.now();
  const posted = await physician.json("/api/v1/rehearsals", "POST", body);
  if (posted.status !== 202)
    throw new Error(`POST answered ${posted.status}: ${await posted.text()}`);
  const { rehearsal } = (await posted.json()) as { rehearsal: { id: number } };

  const during: number[] = [];
  const slow: string[] = [];
  let status = "queued";
  let view: RehearsalView | null = null;
  while (status === "queued" || status === "running") {
    const ms = await boardMs();
    during.push(ms);
    if (ms > 100)
      slow.push(`${ms.toFixed(0)} ms at ${((performance.now() - asked) / 1000).toFixed(1)} s`);
    await new Promise((r) => setTimeout(r, 100));
    if (during.length % 5 === 0) {
      view = (
        (await (await physician.fetch(`/api/v1/rehearsals/${rehearsal.id}`)).json()) as {
          rehearsal: RehearsalView;
        }
      ).rehearsal;
      status = view.status;
    }
  }
  const wall = (performance.now() - asked) / 1000;
  console.log(`app ${BASE_URL}; ${patients} patients × 72 h × 3 care models`);
  console.log(
    `run: ${status}, ${(view!.outcome!.elapsedMs / 1000).toFixed(1)} s in the worker thread, ${wall.toFixed(1)} s from POST to done seen`,
  );
  console.log(`Board API idle:       ${summary(idle)}`);
  console.log(`Board API during run: ${summary(during)}`);
  console.log(
    `Board requests over 100 ms during the run: ${slow.length ? slow.join(", ") : "none"}`,
  );
  for (const m of view!.outcome!.models)
    console.log(
      `${m.model}: median time in band ${(100 * m.medianInBand).toFixed(1)} %, pooled ${(100 * m.inBand).toFixed(1)} %`,
    );
}

main().catch((error: unknown) => {
  console.error(error);
  process.exit(1);
});

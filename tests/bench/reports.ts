/**
 * Reports benchmark: one unit of 60 occupied beds over 30 days, 12 of them on a
 * 1 Hz monitor the whole time and 48 charted every 15–60 min, with orders
 * changing band, adjustments, alerts and verbal orders. Measures, over loopback
 * HTTP to a tiny node:http server calling `loadReport` (the lib function the
 * GET /api/v1/reports/… routes call), p50/p95 of each of the four reports for
 * 30 days grouped by patient, shift and day.
 *
 * The 1 Hz series (31 million samples) are generated in memory one bed at a
 * time and turned into rollup rows by `minuteMeasures`, the same function the
 * services run on every write; the raw 1 Hz readings themselves are not
 * stored, since no report reads them (the charted readings of the other beds
 * are). Half-hour rows are summed from the minute rows by SQL, as the services do.
 * Run on demand: `npm run bench:reports` (needs `npm run db:start`); the unit's
 * clock and shifts are Europe/Berlin from 07:00 unless BENCH_TZ and BENCH_SHIFT
 * say otherwise. Uses its own database and drops it at the end (BENCH_KEEP=1
 * keeps it).
 */
import "../../lib/local-env";
import { execFileSync } from "node:child_process";
import knex from "knex";
import mysql from "mysql2/promise";
import { connectionConfig } from "../../lib/db";
import { agent, get, quantile, serve } from "./http-timing";
import { loadReport } from "../../lib/reports/queries";
import { REPORT_KINDS, type ReportGroup } from "../../lib/reports/types";
import { fio2Timeline, minuteMeasures, MINUTE_MS } from "../../lib/rollups/buckets";
import { SLOTS_FROM_MINUTES, SLOTS_GROUP, minuteRow } from "../../lib/rollups/store";
import type { SeriesReading } from "../../lib/time-in-band";

const DB = "tidemark_bench_reports";
const BEDS = Number(process.env.BENCH_BEDS ?? 60);
const MONITORED = Math.round(BEDS / 5);
const DAYS = Number(process.env.BENCH_DAYS ?? 30);
const WARMUP = 10;
const SAMPLES = 100;

let seed = 12345;
/** A small fixed-seed generator, so every run benches the same data. */
const rnd = () => (seed = (seed * 48271) % 2147483647) / 2147483647;

function mysqlOptions(): mysql.ConnectionOptions {
  const c = connectionConfig("owner", DB);
  return {
    host: c.host,
    port: c.port,
    user: c.user,
    password: c.password,
    database: DB,
    timezone: "Z",
  };
}

type Order = {
  id: number;
  from: number;
  to: number;
  lower: number;
  upper: number;
};

async function seedUnit(): Promise<number> {
  const owner = knex({ client: "mysql2", connection: connectionConfig("owner", DB) });
  const bulk = await mysql.createConnection(mysqlOptions());
  const now = Date.now();
  const start = now - DAYS * 86_400_000;
  const [unitId] = await owner("units").insert({
    code: "BREP",
    name: "Bench unit",
    kind: "icu",
    time_zone: process.env.BENCH_TZ ?? "Europe/Berlin",
    shift_start: process.env.BENCH_SHIFT ?? "07:00",
    shift_hours: 12,
  });
  const [physician] = await owner("users").insert({
    email: "bench-physician@bench.example",
    name: "Bench Physician",
    role: "physician",
    password_hash: "x",
  });
  const [nurse] = await owner("users").insert({
    email: "bench-nurse@bench.example",
    name: "Bench Nurse",
    role: "nurse",
    password_hash: "x",
  });
  let minuteRows = 0;
  let samples = 0;
  const insert = async (table: string, rows: Record<string, unknown>[]) => {
    for (let i = 0; i < rows.length; i += 5000) {
      const chunk = rows.slice(i, i + 5000);
      const cols = Object.keys(chunk[0]!);
      await bulk.query(`INSERT INTO ${table} (${cols.join(",")}) VALUES ?`, [
        chunk.map((r) => cols.map((c) => r[c])),
      ]);
    }
  };

  for (let b = 0; b < BEDS; b++) {
    const [bedId] = await owner("beds").insert({
      unit_id: unitId,
      label: `R${String(b + 1).padStart(2, "0")}`,
      sort_order: b,
    });
    const [patientId] = await owner("patients").insert({
      mrn: `BREP${b}`,
      family_name: `Bench${b}`,
      given_name: "Patient",
      birth_date: "1958-03-01",
      sex: b % 2 ? "male" : "female",
    });
    const [admissionId] = await owner("admissions").insert({
      patient_id: patientId,
      bed_id: bedId,
      admitted_at: new Date(start - 3_600_000),
    });
    await owner("admission_stays").insert({
      admission_id: admissionId,
      patient_id: patientId,
      bed_id: bedId,
      unit_id: unitId,
      started_at: new Date(start - 3_600_000),
    });

    // A new order every 2–4 days; one in five verbal, co-signed within hours.
    const orders: Order[] = [];
    for (let t = start - 3_600_000; t < now;) {
      const next = Math.min(now, t + (2 + rnd() * 2) * 86_400_000);
      const last = next >= now;
      const lower = rnd() < 0.5 ? 92 : 88;
      const verbal = rnd() < 0.2;
      const [id] = await owner("orders").insert({
        patient_id: patientId,
        admission_id: admissionId,
        unit_id: unitId,
        status: last ? "active" : "superseded",
        device: "hfnc",
        spo2_lower_pct: lower,
        spo2_upper_pct: lower + 4,
        pao2_lower_mmhg: 60,
        pao2_upper_mmhg: 100,
        fio2_min: 0.21,
        fio2_max: 0.8,
        initial_fio2: 0.4,
        initial_flow_l_min: 40,
        reassess_minutes: 60,
        rationale: "bench",
        entry_mode: verbal ? "verbal" : "written",
        read_back_confirmed: verbal,
        entered_by: verbal ? nurse : physician,
        prescriber_id: physician,
        cosigned_by: verbal ? physician : null,
        cosigned_at: verbal ? new Date(t + rnd() * 8 * 3_600_000) : null,
        created_at: new Date(t),
        updated_at: new Date(last ? t : next),
      });
      orders.push({ id: Number(id), from: t, to: last ? Infinity : next, lower, upper: lower + 4 });
      t = next;
    }
    const bands = orders.map((o) => ({
      from: new Date(o.from),
      to: o.to === Infinity ? null : new Date(o.to),
      lower: o.lower,
      upper: o.upper,
      reassessMinutes: 60,
    }));

    // The series: 1 Hz for the monitored beds, a charted value every 15–60 min otherwise.
    const series: SeriesReading[] = [];
    const charted: Record<string, unknown>[] = [];
    let spo2 = 93;
    const monitored = b < MONITORED;
    for (let t = start; t < now; t += monitored ? 1000 : (15 + rnd() * 45) * MINUTE_MS) {
      spo2 = Math.min(100, Math.max(78, spo2 + (rnd() - 0.5) * (monitored ? 0.4 : 3)));
      const value = Math.round(spo2);
      series.push({
        t,
        spo2: value,
        fio2: 0.4,
        flow: 40,
        source: monitored ? "monitor" : "manual",
      });
      if (!monitored)
        charted.push({
          patient_id: patientId,
          admission_id: admissionId,
          taken_at: new Date(t),
          spo2_pct: value,
          device: "hfnc",
          flow_l_min: 40,
          fio2: 0.4,
          source: "manual",
          recorded_by: nurse,
        });
    }
    samples += series.length;
    await insert("readings", charted);

    // Adjustments about every 3 h, alerts about 4 a day.
    const adjustments: Record<string, unknown>[] = [];
    const changes: { at: number; fio2: number }[] = [];
    let fio2 = 0.4;
    for (let t = start + rnd() * 3 * 3_600_000; t < now; t += (1 + rnd() * 4) * 3_600_000) {
      const to = Math.min(
        0.8,
        Math.max(0.25, Math.round((fio2 + (rnd() - 0.5) * 0.2) * 100) / 100),
      );
      const order = orders.find((o) => o.from <= t && t < o.to)!;
      adjustments.push({
        patient_id: patientId,
        admission_id: admissionId,
        order_id: order.id,
        device: "hfnc",
        from_fio2: fio2,
        to_fio2: to,
        from_flow_l_min: 40,
        to_flow_l_min: 40,
        reason: to > fio2 ? "below_band" : "wean",
        rationale: "bench",
        applied_at: new Date(t),
        recorded_by: nurse,
        engine_version: "bench",
      });
      changes.push({ at: t, fio2: to });
      fio2 = to;
    }
    await insert("adjustments", adjustments);
    const alerts: Record<string, unknown>[] = [];
    for (
      let t = start + rnd() * 6 * 3_600_000;
      t < now - 3_600_000;
      t += (3 + rnd() * 6) * 3_600_000
    ) {
      const ack = t + (1 + rnd() * 20) * MINUTE_MS;
      const escalated = rnd() < 0.15;
      alerts.push({
        patient_id: patientId,
        admission_id: admissionId,
        unit_id: unitId,
        bed_id: bedId,
        kind: rnd() < 0.7 ? "below_band" : "above_band",
        grade: rnd() < 0.2 ? "urgent" : "routine",
        state: "resolved",
        escalation_level: escalated ? 1 : 0,
        started_at: new Date(t - 60_000),
        opened_at: new Date(t),
        detail_json: "{}",
        notified_at: new Date(t + 5000),
        escalated_at: escalated ? new Date(t + 10 * MINUTE_MS) : null,
        acknowledged_at: new Date(ack),
        acknowledged_by: nurse,
        resolved_at: new Date(ack + rnd() * 40 * MINUTE_MS),
      });
    }
    await insert("alerts", alerts);

    // The rollups, by the services' own function, a day at a time.
    const timeline = fio2Timeline(
      orders.map((o) => ({
        from: o.from,
        to: o.to,
        device: "hfnc" as const,
        initialFio2: 0.4,
        initialFlow: 40,
      })),
      changes,
    );
    let i = 0;
    for (let d = start - (start % MINUTE_MS); d < now + 4 * 3_600_000; d += 86_400_000) {
      const from = d;
      const to = d + 86_400_000;
      while (i < series.length && series[i]!.t < from - 10 * MINUTE_MS) i++;
      let j = i;
      while (j < series.length && series[j]!.t < to) j++;
      const minutes = minuteMeasures({
        series: series.slice(Math.max(0, i - 1), j),
        bands,
        fio2: timeline,
        from,
        to,
      });
      const rows = [...minutes].map(([minute, m]) =>
        minuteRow(
          {
            admissionId: Number(admissionId),
            patientId: Number(patientId),
            bedId: Number(bedId),
            unitId: Number(unitId),
          },
          minute,
          m,
        ),
      );
      minuteRows += rows.length;
      if (rows.length) await insert("rollup_minutes", rows);
    }
    series.length = 0;
    process.stdout.write(`\rseeded bed ${b + 1}/${BEDS}`);
  }
  await owner.raw(`${SLOTS_FROM_MINUTES} ${SLOTS_GROUP}`);
  await owner.raw(
    "ANALYZE TABLE rollup_minutes, rollup_slots, readings, alerts, adjustments, orders",
  );
  console.log(
    `\nseeded ${BEDS} beds × ${DAYS} days: ${samples.toLocaleString("en")} SpO2 samples (${MONITORED} beds at 1 Hz), ${minuteRows.toLocaleString("en")} rollup minute rows`,
  );
  await bulk.end();
  await owner.destroy();
  return Number(unitId);
}

async function main() {
  execFileSync("bash", ["db/scripts/mariadb.sh", "drop-db", DB], { stdio: "ignore" });
  execFileSync("bash", ["db/scripts/mariadb.sh", "create-db", DB], { stdio: "ignore" });
  execFileSync(
    "npx",
    ["tsx", "node_modules/knex/bin/cli.js", "--knexfile", "knexfile.ts", "migrate:latest"],
    { stdio: "ignore", env: { ...process.env, DATABASE_NAME: DB } },
  );
  console.log(
    `command: npm run bench:reports   node ${process.version}, MariaDB private instance (127.0.0.1:3399); unit clock ${process.env.BENCH_TZ ?? "Europe/Berlin"}, shifts from ${process.env.BENCH_SHIFT ?? "07:00"}`,
  );
  const seeded = performance.now();
  const unitId = await seedUnit();
  console.log(`seeding took ${((performance.now() - seeded) / 1000).toFixed(0)} s`);
  const app = knex({
    client: "mysql2",
    connection: connectionConfig("app", DB),
    pool: { min: 4, max: 8 },
  });
  const to = new Date();
  const from = new Date(to.getTime() - DAYS * 86_400_000);
  let worst = 0;
  for (const kind of REPORT_KINDS) {
    for (const groupBy of ["patient", "shift", "day"] as ReportGroup[]) {
      const server = await serve(() => loadReport(app, kind, { unitId, from, to, groupBy }));
      for (let i = 0; i < WARMUP; i++) await get(server.url);
      const times: number[] = [];
      for (let i = 0; i < SAMPLES; i++) times.push(await get(server.url));
      times.sort((a, b) => a - b);
      const p95 = quantile(times, 0.95);
      worst = Math.max(worst, p95);
      console.log(
        `${`${kind}, 30 days by ${groupBy}`.padEnd(36)} p50 ${quantile(times, 0.5).toFixed(1).padStart(6)} ms   p95 ${p95.toFixed(1).padStart(6)} ms   (${SAMPLES} sequential requests)`,
      );
      await server.close();
    }
  }
  console.log(
    `slowest p95 ${worst.toFixed(1)} ms; target p95 ≤ 500 ms: ${worst <= 500 ? "met" : "NOT met"}`,
  );
  agent.destroy();
  await app.destroy();
  if (!process.env.BENCH_KEEP)
    execFileSync("bash", ["db/scripts/mariadb.sh", "drop-db", DB], { stdio: "ignore" });
}

main().catch((error: unknown) => {
  console.error(error);
  if (!process.env.BENCH_KEEP)
    execFileSync("bash", ["db/scripts/mariadb.sh", "drop-db", DB], { stdio: "ignore" });
  process.exit(1);
});

/**
 * Board read benchmark: 60 occupied beds, each with an order history and 7 days
 * of minute-by-minute readings (~600k rows) and their rollups (rebuilt from the
 * raw rows by `rebuildRollups`, timed), plus the Chart trend API for 72 h of
 * one bed. Measures GET latency (p50/p95) over loopback HTTP of (a) a tiny
 * node:http server calling `loadBoard` — the same lib function GET
 * /api/v1/board uses, including the 24 h time in band from the rollups — and
 * (b) a bare node:http server that sends the same SQL statements straight to
 * mysql2 and returns the raw rows, as the floor. Both run in the same process
 * and run.
 * Run on demand: `npm run bench:board` (needs the private MariaDB: `npm run db:start`).
 * Uses its own database and drops it at the end.
 */
import "../../lib/local-env";
import { execFileSync } from "node:child_process";
import knex, { type Knex } from "knex";
import mysql from "mysql2/promise";
import { loadBoard } from "../../lib/board/queries";
import { getTrend } from "../../lib/chart/trend";
import { rebuildRollups } from "../../lib/rollups/store";
import { connectionConfig } from "../../lib/db";
import { agent, get, quantile, serve } from "./http-timing";

const DB = "tidemark_bench_board";
const BEDS = 60;
const DAYS = 7;
const WARMUP = 30;
const SAMPLES = 300;
const POOL = 8;

async function measure(label: string, url: string): Promise<{ p50: number; p95: number }> {
  for (let i = 0; i < WARMUP; i++) await get(url);
  const times: number[] = [];
  for (let i = 0; i < SAMPLES; i++) times.push(await get(url));
  times.sort((a, b) => a - b);
  const p50 = quantile(times, 0.5);
  const p95 = quantile(times, 0.95);
  console.log(
    `${label.padEnd(44)} p50 ${p50.toFixed(1).padStart(6)} ms   p95 ${p95.toFixed(1).padStart(6)} ms   (${SAMPLES} sequential requests)`,
  );
  return { p50, p95 };
}

/** The shared knex connection settings, as plain mysql2 options. */
function mysqlOptions(role: "app" | "owner"): mysql.PoolOptions {
  const c = connectionConfig(role, DB);
  return {
    host: c.host,
    port: c.port,
    user: c.user,
    password: c.password,
    database: DB,
    timezone: "Z",
    decimalNumbers: true,
    supportBigNumbers: true,
  };
}

async function seed(): Promise<number[]> {
  const owner = knex({ client: "mysql2", connection: connectionConfig("owner", DB) });
  const bulk = await mysql.createConnection(mysqlOptions("owner"));
  const now = Date.now();
  const [micu] = await owner("units").insert({ code: "BMICU", name: "Bench ICU", kind: "icu" });
  const [resp] = await owner("units").insert({ code: "BRESP", name: "Bench ward", kind: "ward" });
  const [physician] = await owner("users").insert({
    email: "bench-physician@bench.example",
    name: "Bench Physician",
    role: "physician",
    password_hash: "x",
  });
  const readingCols =
    "(patient_id, admission_id, taken_at, spo2_pct, device, fio2, fio2_estimated, source)";
  let rows = 0;
  const started = performance.now();
  for (let i = 0; i < BEDS; i++) {
    const unitId = i < BEDS / 2 ? micu! : resp!;
    const [bedId] = await owner("beds").insert({
      unit_id: unitId,
      label: `B${String(i + 1).padStart(2, "0")}`,
      sort_order: i,
    });
    const [patientId] = await owner("patients").insert({
      mrn: `BENCH${i}`,
      family_name: `Bench${i}`,
      given_name: "Patient",
      birth_date: "1960-01-01",
      sex: i % 2 ? "male" : "female",
    });
    const admittedAt = new Date(now - (DAYS + 1) * 86_400_000);
    const [admissionId] = await owner("admissions").insert({
      patient_id: patientId,
      bed_id: bedId,
      admitted_at: admittedAt,
    });
    const order = (status: string, lower: number, upper: number, created: Date, updated: Date) => ({
      patient_id: patientId,
      admission_id: admissionId,
      unit_id: unitId,
      status,
      device: "hfnc",
      spo2_lower_pct: lower,
      spo2_upper_pct: upper,
      fio2_min: 0.21,
      fio2_max: 0.8,
      initial_fio2: 0.4,
      initial_flow_l_min: 40,
      reassess_minutes: 120,
      rationale: "bench",
      entry_mode: "written",
      entered_by: physician,
      prescriber_id: physician,
      created_at: created,
      updated_at: updated,
    });
    // A band change 6–12 h ago on every bed, so the 24 h split crosses two orders.
    const change = new Date(now - (6 + (i % 7)) * 3_600_000);
    await owner("orders").insert(order("superseded", 92, 96, admittedAt, change));
    await owner("orders").insert(
      order(i % 10 === 0 ? "awaiting_cosign" : "active", 88, 92, change, change),
    );
    await owner("bedside_settings").insert({
      admission_id: admissionId,
      patient_id: patientId,
      device: "hfnc",
      fio2: 0.4,
      flow_l_min: 40,
      updated_at: new Date(now - 3_600_000),
      last_reassessed_at: new Date(now - (i % 4) * 60 * 60_000),
    });
    await owner("blood_gases").insert({
      patient_id: patientId,
      admission_id: admissionId,
      sampled_at: new Date(now - 5 * 3_600_000),
      sample_type: "arterial",
      pao2_mmhg: 70,
      paco2_mmhg: 40,
      device: "hfnc",
      fio2: 0.4,
      barometric_pressure_mmhg: 760,
      pf_ratio: 175,
      indices_json: "{}",
      engine_version: "bench",
      recorded_by: physician,
    });
    // 7 days × 1440 readings, a bounded random walk around the band.
    let spo2 = 92;
    let batch: unknown[][] = [];
    for (let m = DAYS * 1440; m > 0; m--) {
      spo2 = Math.min(100, Math.max(80, spo2 + Math.round((Math.random() - 0.5) * 2)));
      batch.push([
        patientId,
        admissionId,
        new Date(now - m * 60_000),
        spo2,
        "hfnc",
        0.4,
        0,
        "monitor",
      ]);
      if (batch.length === 5000) {
        await bulk.query(`INSERT INTO readings ${readingCols} VALUES ?`, [batch]);
        rows += batch.length;
        batch = [];
      }
    }
    if (batch.length) await bulk.query(`INSERT INTO readings ${readingCols} VALUES ?`, [batch]);
    rows += batch.length;
  }
  console.log(
    `seeded ${BEDS} occupied beds, ${rows.toLocaleString("en")} readings in ${((performance.now() - started) / 1000).toFixed(0)} s`,
  );
  const rebuildStart = performance.now();
  const { admissions } = await rebuildRollups(owner, {
    from: new Date(now - (DAYS + 1) * 86_400_000),
    to: new Date(now + 4 * 3_600_000),
  });
  const [[counts]] = (await owner.raw(
    "SELECT (SELECT COUNT(*) FROM rollup_minutes) AS minutes, (SELECT COUNT(*) FROM rollup_slots) AS slots",
  )) as [[{ minutes: number; slots: number }]];
  console.log(
    `rollups rebuilt for ${admissions} admissions (${Number(counts.minutes).toLocaleString("en")} minute rows, ${Number(counts.slots).toLocaleString("en")} half-hour rows) in ${((performance.now() - rebuildStart) / 1000).toFixed(1)} s (npm run rollups:rebuild does the same)`,
  );
  await owner.raw(
    "ANALYZE TABLE readings, orders, admissions, beds, rollup_minutes, rollup_slots, admission_stays",
  );
  await bulk.end();
  await owner.destroy();
  return [Number(micu), Number(resp)];
}

async function main() {
  execFileSync("bash", ["db/scripts/mariadb.sh", "drop-db", DB], { stdio: "ignore" });
  execFileSync("bash", ["db/scripts/mariadb.sh", "create-db", DB], { stdio: "ignore" });
  execFileSync(
    "npx",
    ["tsx", "node_modules/knex/bin/cli.js", "--knexfile", "knexfile.ts", "migrate:latest"],
    {
      stdio: "ignore",
      env: { ...process.env, DATABASE_NAME: DB },
    },
  );
  console.log(
    `command: npm run bench:board   node ${process.version}, MariaDB private instance (127.0.0.1:3399)`,
  );
  const unitIds = await seed();

  const app = knex({
    client: "mysql2",
    connection: connectionConfig("app", DB),
    pool: { min: POOL, max: POOL },
  });
  // Record the statements one Board load sends, to replay them verbatim on the bare server.
  const statements: { sql: string; bindings: unknown[] }[] = [];
  const record = (q: { sql: string; bindings?: unknown[] }) =>
    statements.push({ sql: q.sql, bindings: q.bindings ?? [] });
  // Every load reads the same: the rollups hold the 24 h, nothing is kept in memory.
  const firstStart = performance.now();
  await loadBoard(app, unitIds);
  console.log(`first load: ${(performance.now() - firstStart).toFixed(0)} ms`);
  app.on("query", record);
  const sample = await loadBoard(app, unitIds);
  app.off("query", record);
  console.log(
    `Board: ${sample.beds.length} rows, ${statements.length} SQL statements per load (run in parallel)`,
  );

  if (process.env.BENCH_PROFILE) {
    // One line per statement, run alone: where the time goes.
    for (const s of statements) {
      const t0 = performance.now();
      for (let i = 0; i < 5; i++) await app.raw(s.sql, s.bindings as Knex.RawBinding[]);
      console.log(
        `${((performance.now() - t0) / 5).toFixed(1).padStart(7)} ms  ${s.sql.replace(/\s+/g, " ").slice(0, 120)}`,
      );
    }
  }
  const bare = mysql.createPool({ ...mysqlOptions("app"), connectionLimit: POOL });
  const lib = await serve(() => loadBoard(app, unitIds));
  const floor = await serve(async () => {
    const results = await Promise.all(statements.map((s) => bare.query(s.sql, s.bindings)));
    return results.map(([rows]) => rows);
  });
  if (process.env.BENCH_PROFILE_ONLY) process.exit(0);
  const a = await measure("Board (loadBoard via node:http)", lib.url);
  const b = await measure("bare node:http + mysql2, same SQL", floor.url);
  console.log(
    `Board overhead over the bare SQL: p50 +${(a.p50 - b.p50).toFixed(1)} ms, p95 +${(a.p95 - b.p95).toFixed(1)} ms (${(a.p95 / b.p95).toFixed(2)}×); target p95 ≤ 50 ms: ${a.p95 <= 50 ? "met" : "NOT met"}, within 2× of the bare server: ${a.p95 <= 2 * b.p95 ? "met" : "NOT met"}`,
  );

  // The Chart's trend for the last 72 h of one bed (4,320 minute readings,
  // downsampled for the chart), through the same lib function as its route.
  const [[first]] = (await app.raw(
    "SELECT patient_id FROM admissions WHERE discharged_at IS NULL ORDER BY id LIMIT 1",
  )) as [[{ patient_id: number }]];
  const actor = {
    id: 1,
    email: "bench-physician@bench.example",
    name: "Bench Physician",
    role: "physician" as const,
    unitIds,
    pressureUnit: "mmHg" as const,
  };
  const trend = await serve(() =>
    getTrend(app, actor, first.patient_id, {
      from: new Date(Date.now() - 72 * 3600_000),
      to: new Date(),
    }),
  );
  await measure("Chart trend, 72 h (getTrend via node:http)", trend.url);
  await trend.close();

  agent.destroy();
  await lib.close();
  await floor.close();
  await bare.end();
  await app.destroy();
  if (!process.env.BENCH_KEEP)
    execFileSync("bash", ["db/scripts/mariadb.sh", "drop-db", DB], { stdio: "ignore" });
}

main().catch((error: unknown) => {
  console.error(error);
  execFileSync("bash", ["db/scripts/mariadb.sh", "drop-db", DB], { stdio: "ignore" });
  process.exit(1);
});

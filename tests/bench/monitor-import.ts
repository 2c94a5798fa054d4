/**
 * Monitor import benchmark: a generated 24-hour, 1 Hz monitor file (86,400
 * rows of time,spo2,pulse_rate) imported through the interface-engine path
 * (stream-parsed, checked, inserted 1,000 rows per INSERT in one transaction,
 * alert detection per batch, one ledger row), then the same day through the
 * app's preview + confirm. Reports wall time, peak RSS and the heap growth,
 * next to a 1/10 file to show that memory does not grow with the rows.
 * The npm script caps the JavaScript heap at 64 MB (about 20 MB of it is the
 * app's own modules), so a per-row leak fails the run instead of hiding in a
 * big heap. Run on demand: `npm run bench:import` (needs `npm run db:start`).
 * Uses its own database.
 */
import "../../lib/local-env";
import { execFileSync } from "node:child_process";
import { randomBytes } from "node:crypto";
import knex from "knex";

const DB = "tidemark_bench_import";
process.env.DATABASE_NAME = DB;

function monitorFile(rows: number, start: number): Buffer {
  const parts: string[] = ["time,spo2,pulse_rate"];
  for (let i = 0; i < rows; i++) {
    // An invented, gently wandering series.
    const spo2 = 93 + Math.round(3 * Math.sin(i / 600));
    const pulse = 84 + Math.round(6 * Math.sin(i / 300));
    parts.push(`${new Date(start + i * 1000).toISOString()},${spo2},${pulse}`);
  }
  return Buffer.from(`${parts.join("\n")}\n`);
}

async function measured<T>(label: string, run: () => Promise<T>): Promise<T> {
  global.gc?.();
  const heapBefore = process.memoryUsage().heapUsed;
  let peakRss = process.memoryUsage().rss;
  let peakHeap = heapBefore;
  const sampler = setInterval(() => {
    const m = process.memoryUsage();
    peakRss = Math.max(peakRss, m.rss);
    peakHeap = Math.max(peakHeap, m.heapUsed);
  }, 20);
  const start = performance.now();
  const result = await run();
  const seconds = (performance.now() - start) / 1000;
  clearInterval(sampler);
  global.gc?.();
  const retained = process.memoryUsage().heapUsed - heapBefore;
  const mb = (b: number) => `${(b / 1024 / 1024).toFixed(0)} MB`;
  console.log(
    `${label.padEnd(44)} ${seconds.toFixed(2).padStart(6)} s   peak RSS ${mb(peakRss).padStart(7)}   heap at start ${mb(heapBefore).padStart(6)}, peak growth ${mb(peakHeap - heapBefore).padStart(6)}, retained ${mb(retained).padStart(5)}`,
  );
  return result;
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
  const { connectionConfig, closeDb, db } = await import("../../lib/db");
  const { importFromToken } = await import("../../lib/imports/service");
  const { loadUnit } = await import("../../lib/imports/evaluate");
  const { confirmImportOperation, previewUpload } = await import("../../lib/imports/operations");
  const { loadActor } = await import("../../lib/auth/actor-queries");
  const owner = knex({ client: "mysql2", connection: connectionConfig("owner", DB) });

  const [unitId] = await owner("units").insert({ code: "BENCH", name: "Bench ICU", kind: "icu" });
  const [userId] = await owner("users").insert({
    email: "bench@bench.example",
    name: "Bench Therapist",
    role: "therapist",
    password_hash: "x",
  });
  await owner("user_units").insert({ user_id: userId, unit_id: unitId });
  const [tokenId] = await owner("api_tokens").insert({
    name: "Bench engine",
    token_hash: randomBytes(32).toString("hex"),
    prefix: "tdm_bench",
    scope: "write",
    created_by: userId,
    expires_at: new Date(Date.now() + 24 * 3600_000),
  });
  await owner("api_token_units").insert({ api_token_id: tokenId, unit_id: unitId });
  const now = new Date();
  const dayAgo = now.getTime() - 25 * 3600_000;

  async function patient(tag: string) {
    const [bedId] = await owner("beds").insert({ unit_id: unitId, label: tag });
    const [patientId] = await owner("patients").insert({
      mrn: `BENCH${tag}`,
      family_name: "Bench",
      given_name: tag,
      birth_date: "1960-01-01",
      sex: "female",
    });
    const [admissionId] = await owner("admissions").insert({
      patient_id: patientId,
      bed_id: bedId,
      admitted_at: new Date(dayAgo - 3600_000),
    });
    await owner("bedside_settings").insert({
      admission_id: admissionId,
      patient_id: patientId,
      device: "hfnc",
      fio2: 0.4,
      flow_l_min: 40,
      updated_at: now,
      last_reassessed_at: now,
    });
    return { mrn: `BENCH${tag}`, bed: tag };
  }

  const unit = (await loadUnit(db(), Number(unitId)))!;
  const token = {
    tokenId: Number(tokenId),
    name: "Bench engine",
    scope: "write" as const,
    unitIds: [Number(unitId)],
  };
  const small = monitorFile(8_640, dayAgo);
  const day = monitorFile(86_400, dayAgo);
  console.log(`file: 86,400 rows, ${(day.length / 1024 / 1024).toFixed(1)} MB`);

  for (const [label, file, tag] of [
    ["API import, 8,640 rows (2.4 h)", small, "A"],
    ["API import, 86,400 rows (24 h at 1 Hz)", day, "B"],
  ] as const) {
    const who = await patient(tag);
    const result = await measured(label, () =>
      importFromToken(
        db(),
        token,
        { kind: "monitor_csv", content: file, fileName: "day.csv", partial: false, unit, ...who },
        now,
      ),
    );
    if (result.preview.counts.accepted !== file.toString().split("\n").length - 2)
      throw new Error("not every row was imported");
  }

  const actor = await loadActor(db(), Number(userId));
  const who = await patient("C");
  const preview = await measured("App preview, 86,400 rows", () =>
    previewUpload(
      db(),
      actor,
      { kind: "monitor_csv", unitId: Number(unitId), fileName: "day.csv", ...who },
      day,
      now,
    ),
  );
  await measured("App confirm, 86,400 rows", () =>
    confirmImportOperation.invoke(
      db(),
      actor,
      { importId: preview.id, expectedAccepted: preview.counts.accepted },
      now,
    ),
  );
  await owner.destroy();
  await closeDb();
  execFileSync("bash", ["db/scripts/mariadb.sh", "drop-db", DB], { stdio: "ignore" });
}

main().catch((error: unknown) => {
  console.error(error);
  process.exit(1);
});

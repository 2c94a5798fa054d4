/**
 * Ledger write benchmark: 8 concurrent writers, each committing one row per
 * transaction, against (a) a plain single-row insert, (b) the hash-chained
 * ledger with one chain per patient (the design), (c) the same ledger forced
 * onto one global chain. (a) and (b) alternate for ROUNDS rounds. Run on demand: `npm run bench:ledger` (needs the
 * private MariaDB running: `npm run db:start`). Uses its own database.
 */
import "../../lib/local-env";
import { execFileSync } from "node:child_process";
import knex, { type Knex } from "knex";
import { connectionConfig } from "../../lib/db";
import { appendLedger } from "../../lib/ledger/service";

const WRITERS = 8;
const SECONDS = 4;
const ROUNDS = 5;
const DB = "tidemark_bench";

async function timed(
  label: string,
  pool: Knex,
  write: (writer: number, i: number) => Promise<void>,
): Promise<number> {
  let done = 0;
  const until = Date.now() + SECONDS * 1000;
  const start = performance.now();
  await Promise.all(
    Array.from({ length: WRITERS }, async (_, writer) => {
      for (let i = 0; Date.now() < until; i++) {
        await write(writer, i);
        done++;
      }
    }),
  );
  const rate = done / ((performance.now() - start) / 1000);
  console.log(
    `${label.padEnd(34)} ${Math.round(rate).toString().padStart(7)} commits/s (${done} in ${SECONDS} s, ${WRITERS} writers)`,
  );
  void pool;
  return rate;
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
  const owner = knex({ client: "mysql2", connection: connectionConfig("owner", DB) });
  await owner.schema.createTable("bench_raw", (t) => {
    t.bigIncrements("id");
    t.integer("writer");
    t.text("payload");
  });
  const [actorId] = await owner("users").insert({
    email: "bench@bench.example",
    name: "Bench",
    role: "admin",
    password_hash: "x",
  });
  await owner.destroy();

  const pool = knex({
    client: "mysql2",
    connection: connectionConfig("app", DB),
    pool: { min: WRITERS, max: WRITERS },
  });
  const actor = { id: Number(actorId), role: "admin" as const };
  const entry = (patientId: number) => ({
    action: "reading.chart" as const,
    entityType: "reading" as const,
    entityId: 1,
    patientId,
    after: { spo2: 94, device: "nasal_cannula", flow: 2 },
  });

  console.log(`command: npm run bench:ledger   node ${process.version}, MariaDB private instance`);
  // Plain and chained alternate, round after round, so a change in the machine's
  // load falls on both; the ratio is taken per round and its median reported.
  const ratios: number[] = [];
  const raws: number[] = [];
  for (let round = 1; round <= ROUNDS; round++) {
    const raw = await timed(`round ${round}: plain single-row insert`, pool, async (writer) => {
      await pool.transaction((trx) => trx("bench_raw").insert({ writer, payload: '{"spo2":94}' }));
    });
    const perPatient = await timed(
      `round ${round}: one chain per patient`,
      pool,
      async (writer) => {
        await pool.transaction((trx) => appendLedger(trx, actor, entry(writer + 1)));
      },
    );
    raws.push(raw);
    ratios.push(perPatient / raw);
  }
  const global = await timed("ledger, one global chain", pool, async () => {
    await pool.transaction((trx) => appendLedger(trx, actor, entry(999)));
  });
  const median = (xs: number[]) => [...xs].sort((a, b) => a - b)[Math.floor(xs.length / 2)]!;
  console.log(
    `per-patient chain: median ${Math.round(median(ratios) * 100)} % of the plain insert rate over ${ROUNDS} alternating rounds (${ratios.map((r) => Math.round(r * 100)).join(", ")} %); global chain: ${Math.round((global / median(raws)) * 100)} % of the median plain rate`,
  );
  await pool.destroy();
  execFileSync("bash", ["db/scripts/mariadb.sh", "drop-db", DB], { stdio: "ignore" });
}

main().catch((error: unknown) => {
  console.error(error);
  process.exit(1);
});

/**
 * Ledger verification benchmark: 1,000,000 keyed ledger rows in 5,000 patient
 * chains and the admin chain, interleaved as real writes are. Measures the full
 * verify (target ≥ 200,000 rows/s), writing the first anchor, and the
 * incremental verify from that anchor after 1,000 more appends (target < 1 s).
 * Run on demand: `npm run bench:verify` (needs the private MariaDB running:
 * `npm run db:start`). Uses its own database, dropped at the end.
 */
import "../../lib/local-env";
import { execFileSync } from "node:child_process";
import { mkdtemp, rm } from "node:fs/promises";
import { tmpdir } from "node:os";
import path from "node:path";
import knex from "knex";
import * as guard from "../../db/migrations/20261204000200_ledger_chains_guarded";
import { connectionConfig } from "../../lib/db";
import { anchorLedger } from "../../lib/ledger/anchor";
import { GENESIS_HASH, keyedLedgerHash, type HashedLedgerFields } from "../../lib/ledger/hash";
import { ledgerKeys } from "../../lib/ledger/keys";
import { appendLedger, SYSTEM_ACTOR } from "../../lib/ledger/service";
import { verifyLedger } from "../../lib/ledger/verify";

const ROWS = Number(process.env.BENCH_ROWS ?? 1_000_000);
const CHAINS = 5_000;
const APPENDS = 1_000;
const ROUNDS = 3;
const DB = "tidemark_bench_verify";

const mariadb = (...args: string[]) =>
  execFileSync("bash", ["db/scripts/mariadb.sh", ...args], { stdio: "ignore" });

async function main() {
  mariadb("drop-db", DB);
  mariadb("create-db", DB);
  execFileSync(
    "npx",
    ["tsx", "node_modules/knex/bin/cli.js", "--knexfile", "knexfile.ts", "migrate:latest"],
    { stdio: "ignore", env: { ...process.env, DATABASE_NAME: DB } },
  );
  const owner = knex({
    client: "mysql2",
    connection: connectionConfig("owner", DB),
    pool: { min: 1, max: 1 },
  });
  const app = knex({ client: "mysql2", connection: connectionConfig("app", DB) });
  const dir = await mkdtemp(path.join(tmpdir(), "tidemark-bench-anchor-"));
  const anchorPath = path.join(dir, "anchor.json");
  try {
    console.log(
      `command: npm run bench:verify   node ${process.version}, MariaDB private instance, ${ROWS.toLocaleString("en-GB")} rows`,
    );
    // Seeding as the owner: the head triggers would have every head climb one
    // row per UPDATE, so they are lifted (the migration's own down/up) around it.
    const seedStart = performance.now();
    await guard.down(owner);
    const keys = ledgerKeys();
    const tails = new Map<string, { seq: number; hash: string }>();
    let t = Date.UTC(2026, 10, 1);
    for (let done = 0; done < ROWS;) {
      const batch = [];
      for (let i = 0; i < 2000 && done < ROWS; i++, done++) {
        // Mostly patient chains, one row in 50 for administration.
        const chainKey =
          done % 50 === 0
            ? "admin"
            : `patient:${1 + ((done * 7919 + Math.floor(done / CHAINS)) % CHAINS)}`;
        const prev = tails.get(chainKey) ?? { seq: 0, hash: GENESIS_HASH };
        t += 250;
        const f: HashedLedgerFields = {
          chainKey,
          chainSeq: prev.seq + 1,
          prevHash: prev.hash,
          actorUserId: null,
          actorRole: done % 3 === 0 ? "system" : "interface",
          occurredAt: new Date(t),
          action: "reading.chart",
          entityType: "reading",
          entityId: String(done + 1),
          patientId: chainKey === "admin" ? null : Number(chainKey.slice(8)),
          unitId: chainKey === "admin" ? null : 1,
          beforeJson: null,
          afterJson: `{"spo2":${88 + (done % 12)},"device":"nasal_cannula","flow":${1 + (done % 6)},"source":"monitor"}`,
          rationale: done % 20 === 0 ? "Charted at the bedside after a position change" : null,
        };
        const hash = keyedLedgerHash(keys, f);
        tails.set(chainKey, { seq: f.chainSeq, hash });
        batch.push({
          chain_key: chainKey,
          chain_seq: f.chainSeq,
          prev_hash: f.prevHash,
          hash,
          actor_user_id: null,
          actor_role: f.actorRole,
          occurred_at: f.occurredAt,
          action: f.action,
          entity_type: f.entityType,
          entity_id: f.entityId,
          patient_id: f.patientId,
          unit_id: f.unitId,
          before_json: null,
          after_json: f.afterJson,
          rationale: f.rationale,
        });
      }
      await owner("ledger_entries").insert(batch);
    }
    const heads = [...tails].map(([chain_key, h]) => ({
      chain_key,
      last_seq: h.seq,
      last_hash: h.hash,
    }));
    for (let i = 0; i < heads.length; i += 1000)
      await owner("ledger_chains").insert(heads.slice(i, i + 1000));
    await guard.up(owner);
    console.log(
      `seeded ${ROWS.toLocaleString("en-GB")} rows in ${tails.size.toLocaleString("en-GB")} chains in ${((performance.now() - seedStart) / 1000).toFixed(1)} s`,
    );

    const rates: number[] = [];
    for (let round = 0; round < ROUNDS; round++) {
      const start = performance.now();
      const result = await verifyLedger(app, { anchorPath: null });
      const s = (performance.now() - start) / 1000;
      if (!result.ok || result.checked !== ROWS) throw new Error(JSON.stringify(result));
      rates.push(result.checked / s);
      console.log(
        `full verify, round ${round + 1}: ${s.toFixed(2)} s, ${Math.round(result.checked / s).toLocaleString("en-GB")} rows/s`,
      );
    }
    rates.sort((a, b) => a - b);
    console.log(
      `full verify: median ${Math.round(rates[Math.floor(ROUNDS / 2)]!).toLocaleString("en-GB")} rows/s (target ≥ 200,000)`,
    );

    let start = performance.now();
    const first = await anchorLedger(app, { path: anchorPath });
    if (!first.written) throw new Error(JSON.stringify(first.verification));
    console.log(
      `first anchor (full verify + ${first.anchor!.heads.length} heads signed): ${((performance.now() - start) / 1000).toFixed(2)} s`,
    );

    for (let i = 0; i < APPENDS; i++) {
      await app.transaction((trx) =>
        appendLedger(trx, SYSTEM_ACTOR, {
          action: "reading.chart",
          entityType: "reading",
          entityId: ROWS + i,
          patientId: 1 + ((i * 31) % CHAINS),
          after: { spo2: 93 },
        }),
      );
    }
    const times: number[] = [];
    for (let round = 0; round < ROUNDS; round++) {
      start = performance.now();
      const result = await verifyLedger(app, { anchorPath, mode: "incremental" });
      const ms = performance.now() - start;
      if (!result.ok || result.checked !== APPENDS) throw new Error(JSON.stringify(result));
      times.push(ms);
      console.log(
        `incremental verify, round ${round + 1}: ${ms.toFixed(0)} ms for ${result.checked} rows after the anchor`,
      );
    }
    times.sort((a, b) => a - b);
    console.log(
      `incremental verify: median ${times[Math.floor(ROUNDS / 2)]!.toFixed(0)} ms (target < 1 s)`,
    );
    start = performance.now();
    const next = await anchorLedger(app, { path: anchorPath });
    if (!next.written) throw new Error(JSON.stringify(next.verification));
    console.log(
      `next anchor (incremental verify + heads signed): ${(performance.now() - start).toFixed(0)} ms`,
    );
  } finally {
    await app.destroy();
    await owner.destroy();
    await rm(dir, { recursive: true, force: true });
    if (process.env.BENCH_KEEP !== "1") mariadb("drop-db", DB);
  }
}

main().catch((error: unknown) => {
  console.error(error);
  process.exit(1);
});

import { randomUUID } from "node:crypto";
import path from "node:path";
import { Worker } from "node:worker_threads";
import type { Knex } from "knex";
import { appendLedger, SYSTEM_ACTOR } from "../ledger/service";
import type { RehearsalParameters } from "./parameters";
import type { ThreadJob, ThreadMessage } from "./thread";
import type { RehearsalOutcome } from "./views";
import { isRetryable, transact } from "../transaction";

// Runs queued rehearsals in this process, one at a time, each in a worker
// thread so the server's event loop stays free. The queue is the rehearsals
// table: a run is claimed by a conditional update (status and claimant as
// read), so two app servers never run it twice, and a run whose heartbeat
// stops (its process died) is claimed again, up to MAX_ATTEMPTS.

/** A running run with no progress for this long is taken to be dead. */
export const STALE_AFTER_MS = 2 * 60_000;
const MAX_ATTEMPTS = 3;
/** Progress is written at most this often. */
const PROGRESS_EVERY_MS = 500;

/**
 * The thread bundles its entry with esbuild (about 0.1 s) and runs the
 * bundle: the server's own bundle cannot hold a worker's entry file, and one
 * bundled module runs the engine about a third faster than TypeScript loaded
 * file by file.
 */
const THREAD_FILE = path.join(process.cwd(), "lib", "rehearsal", "thread.ts");
const BOOT = `
const { buildSync } = require("esbuild");
const Module = require("node:module");
const file = ${JSON.stringify(THREAD_FILE)};
const built = buildSync({ entryPoints: [file], bundle: true, platform: "node", format: "cjs", write: false, logLevel: "silent" });
const thread = new Module(file);
thread.filename = file;
thread.paths = Module._nodeModulePaths(${JSON.stringify(path.dirname(THREAD_FILE))});
thread._compile(built.outputFiles[0].text, file);
`;

type Claimed = {
  id: number;
  unitId: number;
  token: string;
  job: ThreadJob;
};

type Candidate = {
  id: number;
  unit_id: number;
  status: "queued" | "running";
  claimed_by: string | null;
  attempts: number;
  seed: number;
  patients: number;
  hours: number;
  parameters_json: string;
};

async function claimNext(knex: Knex, now: Date): Promise<Claimed | null> {
  for (;;) {
    const candidate = (await knex("rehearsals")
      .where("status", "queued")
      .orWhere((w) => {
        void w
          .where("status", "running")
          .where("heartbeat_at", "<", new Date(now.getTime() - STALE_AFTER_MS));
      })
      .orderBy("id")
      .first(
        "id",
        "unit_id",
        "status",
        "claimed_by",
        "attempts",
        "seed",
        "patients",
        "hours",
        "parameters_json",
      )) as Candidate | undefined;
    if (!candidate) return null;
    const token = randomUUID();
    const exhausted = candidate.attempts >= MAX_ATTEMPTS;
    const claimed = await knex("rehearsals")
      .where({ id: candidate.id, status: candidate.status })
      .whereRaw("claimed_by <=> ?", [candidate.claimed_by])
      .update(
        exhausted
          ? {
              status: "failed",
              error: `The run stopped ${MAX_ATTEMPTS} times without finishing.`,
              finished_at: now,
            }
          : {
              status: "running",
              claimed_by: token,
              attempts: candidate.attempts + 1,
              progress: 0,
              started_at: now,
              heartbeat_at: now,
            },
      )
      // Lost a certification conflict on a multi-primary cluster: another node took it.
      .catch((error: unknown) => {
        if (isRetryable(error)) return 0;
        throw error;
      });
    if (claimed !== 1 || exhausted) continue; // another process took it, or it gave up
    return {
      id: candidate.id,
      unitId: candidate.unit_id,
      token,
      job: {
        seed: candidate.seed,
        patients: candidate.patients,
        hours: candidate.hours,
        parameters: JSON.parse(candidate.parameters_json) as RehearsalParameters,
      },
    };
  }
}

/** Runs one job in a worker thread; `onProgress` may return false to stop it. */
function runInThread(
  job: ThreadJob,
  onProgress: (done: number, total: number) => void,
): Promise<RehearsalOutcome> {
  return new Promise((resolve, reject) => {
    const worker = new Worker(BOOT, { eval: true, workerData: job });
    let outcome: RehearsalOutcome | null = null;
    worker.on("message", (message: ThreadMessage) => {
      if (message.type === "progress") onProgress(message.done, message.total);
      else outcome = message.outcome;
    });
    worker.on("error", reject);
    worker.on("exit", (code) => {
      if (outcome) resolve(outcome);
      else reject(new Error(`The rehearsal's thread stopped (exit code ${code}).`));
    });
  });
}

async function runClaimed(knex: Knex, run: Claimed): Promise<void> {
  const mine = () => knex("rehearsals").where({ id: run.id, claimed_by: run.token });
  let lastWrite = 0;
  let writing: Promise<unknown> = Promise.resolve();
  try {
    const outcome = await runInThread(run.job, (done, total) => {
      const now = Date.now();
      if (now - lastWrite < PROGRESS_EVERY_MS || done === total) return;
      lastWrite = now;
      writing = writing.then(() =>
        mine().update({ progress: done / total, heartbeat_at: new Date(now) }),
      );
    });
    await writing;
    await transact(knex, async (trx) => {
      const now = new Date();
      const updated = await trx("rehearsals")
        .where({ id: run.id, claimed_by: run.token })
        .update({
          status: "done",
          progress: 1,
          outcome_json: JSON.stringify(outcome),
          heartbeat_at: now,
          finished_at: now,
        });
      if (updated !== 1) return; // claimed again elsewhere after a stall: that run stores it
      await appendLedger(
        trx,
        SYSTEM_ACTOR,
        {
          action: "rehearsal.finish",
          entityType: "rehearsal",
          entityId: run.id,
          unitId: run.unitId,
          after: { models: outcome.models, elapsedMs: outcome.elapsedMs },
        },
        now,
      );
    });
  } catch (error) {
    await writing.catch(() => undefined);
    const reason = error instanceof Error ? error.message : String(error);
    await mine().update({
      status: "failed",
      error: `The run failed: ${reason}`.slice(0, 500),
      finished_at: new Date(),
    });
  }
}

let draining: Promise<void> | null = null;
let again = false;

/**
 * Makes sure this process works through the queue: starts the loop if it is
 * idle, or has it look again once it is done. Resolves when the queue is
 * empty (tests wait on it; the routes do not).
 */
export function kickRehearsals(knex: Knex): Promise<void> {
  again = true;
  draining ??= (async () => {
    while (again) {
      again = false;
      for (
        let run = await claimNext(knex, new Date());
        run;
        run = await claimNext(knex, new Date())
      )
        await runClaimed(knex, run);
    }
  })()
    .catch((error: unknown) => console.error("[rehearsals] the queue stopped:", error))
    .finally(() => {
      draining = null;
    });
  return draining;
}

/**
 * The body of a rehearsal's worker thread (lib/rehearsal/runner.ts starts
 * it): runs the cohort off the server's event loop, posting progress after
 * each patient and the outcome at the end. Nothing here touches the database.
 */
import { parentPort, workerData } from "node:worker_threads";
import { rehearsalBasis, type RehearsalParameters } from "./parameters";
import { runRehearsal } from "./run";
import type { RehearsalOutcome } from "./views";

export type ThreadJob = {
  seed: number;
  patients: number;
  hours: number;
  parameters: RehearsalParameters;
};

export type ThreadMessage =
  { type: "progress"; done: number; total: number } | { type: "done"; outcome: RehearsalOutcome };

const job = workerData as ThreadJob;
const post = (message: ThreadMessage) => parentPort!.postMessage(message);
const started = performance.now();
const result = runRehearsal({
  seed: job.seed,
  patients: job.patients,
  hours: job.hours,
  parameters: job.parameters,
  onProgress: (done, total) => post({ type: "progress", done, total }),
});
post({
  type: "done",
  outcome: {
    models: result.models,
    stays: result.stays,
    basis: rehearsalBasis(job.parameters),
    elapsedMs: Math.round(performance.now() - started),
  },
});

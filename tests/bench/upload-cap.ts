/**
 * Upload cap benchmark: peak memory of the streaming body cap itself
 * (readBodyBytes, lib/http.ts — the function the upload routes call) when a
 * 50 MB chunked body (no Content-Length) arrives, against reading the whole
 * body with `await request.arrayBuffer()`.
 *
 * What is measured: one web Request, built in-process, whose ReadableStream
 * body makes fresh 64 KB chunks only when read; the cap is the app's upload
 * route's (MAX_IMPORT_BYTES.monitor_csv + 64 KB, about 12 MB), and the HL7
 * token route's (1 MB). Not measured: the HTTP server, Next's request
 * handling, multipart parsing or anything after the cap.
 *
 * Each scenario runs in its own child process (RSS never shrinks back, so runs
 * must not share one), after a forced GC; memory is sampled on every chunk
 * the body produces and on a 2 ms timer, and the peak growth over the start is
 * reported: RSS, V8 heap, and `arrayBuffers` (the Buffers and ArrayBuffers
 * outside the heap, where the body bytes live). Medians of RUNS runs.
 * Run on demand: `npm run bench:upload-cap`. Not a test.
 */
import { fork } from "node:child_process";
import { fileURLToPath } from "node:url";

const TOTAL_BYTES = 50 * 1024 * 1024;
const CHUNK_BYTES = 64 * 1024;
const RUNS = 5;

type Scenario = "cap-upload" | "cap-hl7" | "whole-body";
const SCENARIOS: Record<Scenario, string> = {
  "cap-upload": "readBodyBytes, app upload cap (12 MB + 64 KB)",
  "cap-hl7": "readBodyBytes, HL7 token route cap (1 MB)",
  "whole-body": "await request.arrayBuffer() (no cap)",
};

type Sample = { rss: number; heapUsed: number; arrayBuffers: number };
type Result = { growth: Sample; bytesProduced: number; outcome: string };

function sample(): Sample {
  const m = process.memoryUsage();
  return { rss: m.rss, heapUsed: m.heapUsed, arrayBuffers: m.arrayBuffers };
}

/** A chunked 50 MB upload: no Content-Length, each 64 KB chunk made when the reader asks. */
function chunkedRequest(onChunk: () => void): { request: Request; produced: () => number } {
  let produced = 0;
  const body = new ReadableStream<Uint8Array>({
    pull(controller) {
      if (produced >= TOTAL_BYTES) {
        controller.close();
        return;
      }
      const size = Math.min(CHUNK_BYTES, TOTAL_BYTES - produced);
      // A fresh buffer per chunk, as a socket hands them over; filled so the pages are real.
      controller.enqueue(new Uint8Array(size).fill(0x41));
      produced += size;
      onChunk();
    },
  });
  const init = { method: "POST", body, duplex: "half" } as RequestInit;
  const request = new Request("http://bench.invalid/api/v1/imports", init);
  return { request, produced: () => produced };
}

async function runScenario(scenario: Scenario): Promise<Result> {
  const { readBodyBytes } = await import("../../lib/http");
  const { MAX_IMPORT_BYTES } = await import("../../lib/imports/upload-rules");
  const gc = (globalThis as { gc?: () => void }).gc;
  if (!gc) throw new Error("Run with --expose-gc (npm run bench:upload-cap does).");
  gc();
  gc();
  const start = sample();
  const peak = { ...start };
  const record = () => {
    const s = sample();
    peak.rss = Math.max(peak.rss, s.rss);
    peak.heapUsed = Math.max(peak.heapUsed, s.heapUsed);
    peak.arrayBuffers = Math.max(peak.arrayBuffers, s.arrayBuffers);
  };
  const timer = setInterval(record, 2);
  const { request, produced } = chunkedRequest(record);
  let outcome: string;
  try {
    if (scenario === "whole-body") {
      const whole = await request.arrayBuffer();
      record();
      outcome = `read ${(whole.byteLength / 1024 / 1024).toFixed(0)} MB`;
    } else {
      const cap =
        scenario === "cap-upload" ? MAX_IMPORT_BYTES.monitor_csv + 64 * 1024 : MAX_IMPORT_BYTES.hl7;
      const bytes = await readBodyBytes(request, cap);
      record();
      outcome = `not refused: read ${bytes.byteLength} bytes`;
    }
  } catch (error) {
    record();
    const status = (error as { status?: number }).status;
    outcome = status === 413 ? "refused 413" : `failed: ${String(error)}`;
  }
  clearInterval(timer);
  return {
    growth: {
      rss: peak.rss - start.rss,
      heapUsed: peak.heapUsed - start.heapUsed,
      arrayBuffers: peak.arrayBuffers - start.arrayBuffers,
    },
    bytesProduced: produced(),
    outcome,
  };
}

function runChild(scenario: Scenario): Promise<Result> {
  return new Promise((resolve, reject) => {
    const child = fork(fileURLToPath(import.meta.url), [scenario], {
      execArgv: [...process.execArgv, "--expose-gc"],
    });
    child.once("message", (message) => resolve(message as Result));
    child.once("error", reject);
    child.once("exit", (code) => {
      if (code !== 0) reject(new Error(`${scenario} exited with ${code}`));
    });
  });
}

const mb = (bytes: number) => (bytes / 1024 / 1024).toFixed(1);
const median = (values: number[]) => {
  const sorted = [...values].sort((a, b) => a - b);
  return sorted[Math.floor(sorted.length / 2)]!;
};

async function main() {
  const own = process.argv[2] as Scenario | undefined;
  if (own) {
    const result = await runScenario(own);
    // The IPC channel would keep this child alive; close it once the figures are sent.
    process.send!(result, () => process.disconnect());
    return;
  }
  console.log(
    `A ${TOTAL_BYTES / 1024 / 1024} MB chunked body in ${CHUNK_BYTES / 1024} KB chunks; peak growth over the start, median of ${RUNS} runs (min–max), each run in its own process.`,
  );
  for (const scenario of Object.keys(SCENARIOS) as Scenario[]) {
    const results: Result[] = [];
    for (let i = 0; i < RUNS; i++) results.push(await runChild(scenario));
    const stat = (key: keyof Sample) => {
      const values = results.map((r) => r.growth[key]);
      return `${mb(median(values)).padStart(6)} MB (${mb(Math.min(...values))}–${mb(Math.max(...values))})`;
    };
    console.log(`\n${SCENARIOS[scenario]}`);
    console.log(
      `  ${results[0]!.outcome} after ${mb(median(results.map((r) => r.bytesProduced)))} MB produced`,
    );
    console.log(`  arrayBuffers ${stat("arrayBuffers")}`);
    console.log(`  RSS          ${stat("rss")}`);
    console.log(`  heap         ${stat("heapUsed")}`);
  }
}

main().catch((error: unknown) => {
  console.error(error);
  process.exit(1);
});

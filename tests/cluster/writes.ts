/**
 * Eight writers through the load balancer for 60 s while a Galera node is
 * killed (-9) and restarted and an app server is killed; then what must hold.
 */
import type { Knex } from "knex";
import { verifyLedger } from "../../lib/ledger/verify";
import {
  clusterNodes,
  nodeDb,
  part,
  sleep,
  status,
  tableChecksums,
  until,
  type ClusterNode,
} from "./control";
import {
  adjustmentWriter,
  drive,
  importWriter,
  orderWriter,
  readingWriter,
  ROWS_PER_UPLOAD,
  type Ack,
  type Kind,
  type Writer,
} from "./load";
import { outcome, type Outcome } from "./outcome";
import { monitorToken, patientOnHfnc, signIn } from "./setup";

const SECONDS = Number(process.env.CLUSTER_LOAD_SECONDS ?? 60);
const TABLE: Record<Kind, string> = {
  order: "orders",
  adjustment: "adjustments",
  reading: "readings",
  import: "imports",
};

/** The rejoin time of the last killed node, for the README's figures. */
export let lastRejoinSeconds: number | null = null;

async function writers(): Promise<Writer[]> {
  const physician = await signIn("physician");
  const therapist = await signIn("therapist");
  const nurse = await signIn("nurse");
  const token = await monitorToken();
  const out: Writer[] = [];
  for (let i = 0; i < 2; i++) {
    const p = await patientOnHfnc(physician);
    out.push(orderWriter(await signIn("physician"), p, p.orderId));
  }
  for (let i = 0; i < 3; i++) {
    const p = await patientOnHfnc(physician);
    out.push(
      adjustmentWriter(i === 0 ? therapist : await signIn("therapist"), p, p.settingsVersion),
    );
  }
  for (let i = 0; i < 2; i++) {
    const p = await patientOnHfnc(physician);
    out.push(readingWriter(i === 0 ? nurse : await signIn("nurse"), p));
  }
  out.push(importWriter(token, await patientOnHfnc(physician)));
  return out;
}

/** Waits until every node is Synced at the same committed seqno (writers stopped, workers paused). */
export async function quiesce(dbs: Knex[]): Promise<boolean> {
  return until(async () => {
    const states = await Promise.all(dbs.map((k) => status(k, "wsrep_local_state")));
    const seqnos = await Promise.all(dbs.map((k) => status(k, "wsrep_last_committed")));
    return states.every((s) => s === "4") && new Set(seqnos).size === 1;
  }, 60_000);
}

/** What every test after a fault checks: the ledger on each node and row-for-row agreement. */
export async function agreement(nodes: ClusterNode[], dbs: Knex[]): Promise<Outcome[]> {
  const out: Outcome[] = [];
  await part("worker-pause", 1);
  await part("worker-pause", 2);
  try {
    const quiet = await quiesce(dbs);
    out.push(outcome("all nodes Synced at the same seqno", quiet));
    for (const [i, k] of dbs.entries()) {
      const v = await verifyLedger(k, { anchorPath: null, mode: "full" });
      out.push(
        outcome(
          `ledger verifies on node ${nodes[i]!.n}`,
          v.ok,
          `${v.checked} rows${v.firstBroken ? `; first broken: ${JSON.stringify(v.firstBroken)}` : ""}`,
        ),
      );
    }
    const sums = await Promise.all(dbs.map((k) => tableChecksums(k)));
    const differ = [...sums[0]!.keys()].filter((t) =>
      sums.some((s) => s.get(t) !== sums[0]!.get(t)),
    );
    out.push(
      outcome(
        "the nodes agree row for row (every column of every table)",
        differ.length === 0 && sums[0]!.size > 20,
        differ.length
          ? differ.map((t) => `${t}: ${sums.map((s) => s.get(t)).join(" | ")}`).join("; ")
          : `${sums[0]!.size} tables`,
      ),
    );
  } finally {
    await part("worker-resume", 1);
    await part("worker-resume", 2);
  }
  return out;
}

export async function loadWithFaults(): Promise<Outcome[]> {
  const nodes = clusterNodes();
  const dbs = nodes.map(nodeDb);
  const ws = await writers();
  const acks: Ack[] = [];
  const t0 = Date.now();
  const at = (s: number) => sleep(Math.max(0, t0 + s * 1000 - Date.now()));
  const marks: Record<string, number> = {};
  const faults = (async () => {
    await at(SECONDS * 0.2);
    marks.nodeKilled = Date.now();
    await part("node-kill", 2);
    console.log(`   node 2 killed at ${Math.round((Date.now() - t0) / 1000)} s`);
    await at(SECONDS * 0.45);
    marks.nodeStarted = Date.now();
    await part("node-start", 2);
    await part("node-wait", 2);
    marks.nodeSynced = Date.now();
    lastRejoinSeconds = (marks.nodeSynced - marks.nodeStarted) / 1000;
    console.log(`   node 2 Synced again ${lastRejoinSeconds.toFixed(1)} s after its restart`);
    await at(SECONDS * 0.7);
    marks.appKilled = Date.now();
    await part("app-kill", 2);
    console.log(`   app server 2 killed at ${Math.round((Date.now() - t0) / 1000)} s`);
  })().then(
    () => null,
    (error: unknown) => String(error),
  );
  await drive(ws, t0 + SECONDS * 1000, acks);
  const faultError = await faults;
  await part("app-start", 2);

  const out: Outcome[] = [];
  out.push(
    outcome("the faults were injected as planned", faultError === null, faultError ?? undefined),
  );
  const byKind = (k: Kind) => acks.filter((a) => a.kind === k);
  const resent = ws.reduce((n, w) => n + w.stats.resent, 0);
  const refused = ws.flatMap((w) => w.stats.refused);
  out.push(
    outcome(
      `${acks.length} writes acknowledged by 8 writers in ${SECONDS} s`,
      acks.length > 100 && refused.length === 0,
      `orders ${byKind("order").length}, adjustments ${byKind("adjustment").length}, readings ${byKind("reading").length}, imports ${byKind("import").length}; ${resent} sent again after a lost answer` +
        (refused.length ? `; refused: ${refused.slice(0, 3).join(" / ")}` : ""),
    ),
  );
  const during = acks.filter((a) => a.at > marks.nodeKilled! && a.at < marks.nodeSynced!).length;
  out.push(
    outcome(
      "writes went on while node 2 was down",
      during > 0,
      `${during} acknowledged between the kill and the rejoin; rejoin ${lastRejoinSeconds?.toFixed(1)} s after restart`,
    ),
  );
  const afterAppKill = acks.filter((a) => a.at > marks.appKilled! + 3000).length;
  out.push(
    outcome(
      "requests went to the other app servers after app server 2 was killed",
      afterAppKill > 0,
      `${afterAppKill} acknowledged after it (from 3 s on)`,
    ),
  );

  const quiet = await quiesce(dbs);
  for (const [i, k] of dbs.entries()) {
    const missing: string[] = [];
    for (const kind of ["order", "adjustment", "reading", "import"] as const) {
      const ids = [...new Set(byKind(kind).map((a) => a.id))];
      const found = new Set(
        ((await k(TABLE[kind]).whereIn("id", ids).pluck("id")) as number[]).map(Number),
      );
      missing.push(...ids.filter((id) => !found.has(id)).map((id) => `${kind} ${id}`));
    }
    out.push(
      outcome(
        `every acknowledged write is on node ${nodes[i]!.n}`,
        quiet && missing.length === 0,
        missing.length
          ? `missing: ${missing.slice(0, 10).join(", ")}`
          : `${acks.length} of ${acks.length}`,
      ),
    );
  }

  // No write twice: each writer's patient holds exactly its acknowledged rows.
  const k = dbs[0]!;
  const twice: string[] = [];
  for (const w of ws) {
    const mine = acks.filter((a) => a.patientId === w.patientId);
    const distinct = new Set(mine.map((a) => a.id)).size;
    let rows: number;
    let expected: number;
    if (w.kind === "import") {
      rows = Number(
        (
          (await k("readings")
            .where({ patient_id: w.patientId, source: "monitor" })
            .count({ n: "*" })
            .first()) as { n: number }
        ).n,
      );
      expected = distinct * ROWS_PER_UPLOAD;
    } else {
      const q = k(TABLE[w.kind]).where({ patient_id: w.patientId });
      if (w.kind === "reading") void q.where({ source: "manual" });
      rows = Number(((await q.count({ n: "*" }).first()) as { n: number }).n);
      // The order writers' patients also hold the first order, written before the load.
      expected = distinct + (w.kind === "order" ? 1 : 0);
    }
    if (rows !== expected)
      twice.push(`${w.kind} patient ${w.patientId}: ${rows} rows for ${expected}`);
  }
  out.push(
    outcome(
      "no write stored twice (rows per writer = acknowledged writes)",
      twice.length === 0,
      twice.join("; ") || `${ws.length} writers`,
    ),
  );
  out.push(...(await agreement(nodes, dbs)));
  await Promise.all(dbs.map((d) => d.destroy()));
  return out;
}

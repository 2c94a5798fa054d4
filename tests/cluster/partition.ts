/**
 * One node cut off from the other two. With network namespaces (root), its
 * link goes down: a real partition, and the node, asked over its unix socket,
 * must say it is not in the primary component and refuse a write. Without them
 * its process is paused (SIGSTOP), which the others see the same way, but the
 * paused node cannot be asked anything. Either way the others carry on, and
 * the node catches up when it returns.
 */
import { randomUUID } from "node:crypto";
import { clusterNodes, nodeDb, nodeSocketDb, part, status, until } from "./control";
import { settle } from "./load";
import { outcome, type Outcome } from "./outcome";
import { patientOnHfnc, signIn } from "./setup";
import { agreement, quiesce } from "./writes";

export async function partition(): Promise<Outcome[]> {
  const netns = process.env.TIDEMARK_CLUSTER_NETNS === "1";
  const method = netns
    ? "its link to the others cut (network namespaces)"
    : "its process paused with SIGSTOP (no network namespaces on this machine)";
  console.log(`   node 3 cut off: ${method}`);
  const nodes = clusterNodes();
  const dbs = nodes.map(nodeDb);
  const cutOff = nodeSocketDb(nodes[2]!);
  const physician = await signIn("physician");
  const nurse = await signIn("nurse");
  const p = await patientOnHfnc(physician);
  const out: Outcome[] = [];

  await part(netns ? "node-cut" : "node-pause", 3);
  const shrunk = await until(
    async () => (await status(dbs[0]!, "wsrep_cluster_size")) === "2",
    60_000,
  );
  out.push(outcome(`the other two form the primary component (${method})`, shrunk));
  if (netns) {
    const nonPrimary = await until(
      async () => (await status(cutOff, "wsrep_cluster_status")) !== "Primary",
      60_000,
    );
    let refused = "";
    try {
      await cutOff.raw("UPDATE units SET name = name WHERE id = 1");
    } catch (error) {
      refused = `${(error as { errno?: number }).errno} ${(error as Error).message}`;
    }
    out.push(
      outcome(
        "the cut-off node is non-primary and refuses writes",
        nonPrimary && refused.startsWith("1047"),
        refused || "the write was accepted",
      ),
    );
  }
  // A client sends again what got no answer (the load balancer answers 503 for the few seconds
  // the cluster and the app servers' health checks take to drop the cut-off node).
  const acked: number[] = [];
  const stats = { sent: 0, resent: 0, refused: [] as string[] };
  const firstTry = Date.now();
  let firstAck: number | null = null;
  for (let i = 0; i < 20; i++) {
    const body = {
      patientId: p.patientId,
      takenAt: new Date().toISOString(),
      spo2: 94,
      device: "hfnc",
      fio2: 0.4,
      flow: 40,
      idempotencyKey: randomUUID(),
    };
    const res = await settle(() => nurse.json("/api/v1/readings", "POST", body), stats);
    if (res.status === 201) {
      acked.push((res.body as { reading: { id: number } }).reading.id);
      firstAck ??= Date.now();
    } else stats.refused.push(`${res.status} ${JSON.stringify(res.body).slice(0, 200)}`);
  }
  out.push(
    outcome(
      "the others carry on taking writes",
      acked.length === 20,
      `${acked.length} of 20 readings acknowledged; the first ${(((firstAck ?? Date.now()) - firstTry) / 1000).toFixed(1)} s after the first try, ${stats.resent} sent again` +
        (stats.refused.length ? `; refused: ${stats.refused[0]}` : ""),
    ),
  );

  const back = Date.now();
  await part(netns ? "node-reconnect" : "node-resume", 3);
  await part("node-wait", 3);
  const caughtUp = (Date.now() - back) / 1000;
  await quiesce(dbs);
  const there = (await dbs[2]!("readings").whereIn("id", acked).pluck("id")) as number[];
  out.push(
    outcome(
      "node 3 caught up after it returned",
      there.length === acked.length,
      `${there.length} of ${acked.length} readings present; Synced ${caughtUp.toFixed(1)} s after it returned`,
    ),
  );
  out.push(...(await agreement(nodes, dbs)));
  await cutOff.destroy();
  await Promise.all(dbs.map((d) => d.destroy()));
  return out;
}

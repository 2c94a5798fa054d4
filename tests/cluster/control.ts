/**
 * The cluster tests' hands on the running cluster: the parts started by
 * db/scripts/cluster.sh (stopped, killed, cut off and started again through
 * its subcommands) and a direct connection to each Galera node.
 */
import { execFile, execFileSync } from "node:child_process";
import { promisify } from "node:util";
import knex, { type Knex } from "knex";
import { connectionConfig } from "../../lib/db";

const run = promisify(execFile);

export type ClusterNode = { n: number; host: string; port: number; socket: string };

/** Runs one `cluster.sh` part command (node-kill 2, app-start 1…); resolves with its output. */
export async function part(command: string, which: number): Promise<string> {
  const { stdout } = await run("bash", ["db/scripts/cluster.sh", command, String(which)], {
    env: process.env,
  });
  return stdout.trim();
}

export function clusterNodes(): ClusterNode[] {
  return execFileSync("bash", ["db/scripts/cluster.sh", "nodes"], { encoding: "utf8" })
    .trim()
    .split("\n")
    .map((line) => {
      const [n, host, port, socket] = line.split(" ");
      return { n: Number(n), host: host!, port: Number(port), socket: socket! };
    });
}

/** The owner account straight to one node (never through the load balancer). */
export function nodeDb(node: ClusterNode): Knex {
  return knex({
    client: "mysql2",
    connection: { ...connectionConfig("owner"), host: node.host, port: node.port },
    pool: { min: 0, max: 2 },
  });
}

/**
 * The administrator over the node's unix socket: reaches a node the network
 * cannot, to ask a cut-off node how it is.
 */
export function nodeSocketDb(node: ClusterNode): Knex {
  return knex({
    client: "mysql2",
    connection: {
      socketPath: node.socket,
      user: process.env.USER === undefined || process.getuid?.() === 0 ? "root" : process.env.USER,
      database: process.env.DATABASE_NAME,
      timezone: "Z",
    },
    pool: { min: 0, max: 1 },
  });
}

export async function status(k: Knex, name: string): Promise<string | null> {
  const [rows] = (await k.raw("SHOW GLOBAL STATUS LIKE ?", [name])) as [{ Value: string }[]];
  return rows[0]?.Value ?? null;
}

export const sleep = (ms: number) => new Promise((resolve) => setTimeout(resolve, ms));

/** Polls until `check` holds; false after `limitMs`. */
export async function until(
  check: () => Promise<boolean>,
  limitMs: number,
  everyMs = 250,
): Promise<boolean> {
  const end = Date.now() + limitMs;
  while (Date.now() < end) {
    if (await check().catch(() => false)) return true;
    await sleep(everyMs);
  }
  return false;
}

/**
 * Every base table's checksum on one node. Called with the writers stopped,
 * the workers paused and all nodes at the same committed seqno.
 */
export async function tableChecksums(k: Knex): Promise<Map<string, string>> {
  const [tables] = (await k.raw(
    "SELECT TABLE_NAME AS name FROM information_schema.TABLES WHERE TABLE_SCHEMA = DATABASE() AND TABLE_TYPE = 'BASE TABLE' ORDER BY TABLE_NAME",
  )) as [{ name: string }[]];
  const out = new Map<string, string>();
  for (const { name } of tables) {
    const [rows] = (await k.raw(`CHECKSUM TABLE \`${name}\``)) as [{ Checksum: string | null }[]];
    const [count] = (await k.raw(`SELECT COUNT(*) AS n FROM \`${name}\``)) as [{ n: number }[]];
    out.set(name, `${count[0]?.n ?? 0} rows, checksum ${rows[0]?.Checksum ?? "null"}`);
  }
  return out;
}

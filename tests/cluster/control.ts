/**
 * The cluster tests' hands on the running cluster: the parts started by
 * db/scripts/cluster.sh (stopped, killed, cut off and started again through
 * its subcommands) and a direct connection to each Galera node.
 */
import { execFile, execFileSync } from "node:child_process";
import { userInfo } from "node:os";
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
      // The OS user whose socket login administers the nodes (galera.sh's GALERA_ADMIN).
      user: userInfo().username,
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
 * Every table's content on one node: its row count and a 64-bit XOR of each
 * row's MD5 over all columns (NULL marked), history rows of system-versioned
 * tables included. CHECKSUM TABLE is not used: it differs between nodes holding
 * identical rows when a table has stored generated columns. Called with the
 * writers stopped, the workers paused and all nodes at the same seqno.
 */
export async function tableChecksums(k: Knex): Promise<Map<string, string>> {
  const [tables] = (await k.raw(
    `SELECT TABLE_NAME AS name, TABLE_TYPE AS type FROM information_schema.TABLES
      WHERE TABLE_SCHEMA = DATABASE() AND TABLE_TYPE IN ('BASE TABLE', 'SYSTEM VERSIONED')
      ORDER BY TABLE_NAME`,
  )) as [{ name: string; type: string }[]];
  const out = new Map<string, string>();
  for (const { name, type } of tables) {
    const [cols] = (await k.raw(
      `SELECT COLUMN_NAME AS c FROM information_schema.COLUMNS
        WHERE TABLE_SCHEMA = DATABASE() AND TABLE_NAME = ? ORDER BY ORDINAL_POSITION`,
      [name],
    )) as [{ c: string }[]];
    const versioned = type === "SYSTEM VERSIONED";
    const columns = [...cols.map((r) => r.c), ...(versioned ? ["row_start", "row_end"] : [])];
    const row = `CONCAT_WS('#', ${columns.map((c) => `IFNULL(HEX(\`${c}\`), 'N')`).join(", ")})`;
    const [rows] = (await k.raw(
      `SELECT COUNT(*) AS n, BIT_XOR(CAST(CONV(SUBSTRING(MD5(${row}), 1, 16), 16, 10) AS UNSIGNED)) AS h
         FROM \`${name}\`${versioned ? " FOR SYSTEM_TIME ALL" : ""}`,
    )) as [{ n: number; h: string }[]];
    out.set(name, `${rows[0]?.n ?? 0} rows, hash ${rows[0]?.h ?? "none"}`);
  }
  return out;
}

import { createHash } from "node:crypto";
import type { Knex } from "knex";
import { readAnchorFile, type AnchorHead, type AnchorRead } from "./anchor-file";
import { canonicalLedgerEntry, fastLedgerMac, GENESIS_HASH, type LedgerKeys } from "./hash";
import { ledgerAnchorPath, ledgerKeys } from "./keys";

/** Where a chain breaks. `id` 0 means the chain head or the anchor, not a stored row. */
export type LedgerProblem = { id: number; chainKey: string; chainSeq: number; problem: string };

export type LedgerVerification = {
  ok: boolean;
  /** Rows whose keyed hash and link were recomputed (after the anchor, when incremental). */
  checked: number;
  firstBroken: LedgerProblem | null;
  /** Every problem found, in the order found (at most {@link MAX_PROBLEMS}). */
  problems?: LedgerProblem[];
  mode?: "full" | "incremental";
  /** The anchor the database was compared with; null when none has been written yet. */
  anchor?: { createdAt: string; chains: number } | null;
};

export type VerifyOptions = {
  /** "incremental" checks only rows after the last anchor (full when there is none). */
  mode?: "full" | "incremental";
  /** Default: derived from LEDGER_HMAC_KEY. */
  keys?: LedgerKeys;
  /** Default: {@link ledgerAnchorPath}; null compares with no anchor. */
  anchorPath?: string | null;
  /** Rows per query when walking the chains after the anchor (the full walk is one query). */
  batchSize?: number;
};

export const MAX_PROBLEMS = 50;

type Head = { seq: number; hash: string };

// Read as arrays, no per-row objects. The time comes as `Date.toISOString()`
// writes it (the stored DATETIME is UTC; %f is microseconds, cut to
// milliseconds), formatted on the database's thread rather than this one.
const COLUMNS =
  "id, chain_key, chain_seq, prev_hash, hash, actor_user_id, actor_role, CONCAT(LEFT(DATE_FORMAT(occurred_at, '%Y-%m-%dT%T.%f'), 23), 'Z'), action, entity_type, entity_id, patient_id, unit_id, before_json, after_json, rationale";
type RawRow = [
  id: number,
  chainKey: string,
  chainSeq: number | string,
  prevHash: string,
  hash: string,
  actorUserId: number | null,
  actorRole: string,
  occurredAtIso: string,
  action: string,
  entityType: string,
  entityId: string,
  patientId: number | null,
  unitId: number | null,
  beforeJson: string | null,
  afterJson: string | null,
  rationale: string | null,
];
const ROW_OPTIONS = { rowsAsArray: true };

async function rawRows(knex: Knex, sql: string, bindings: readonly unknown[]): Promise<RawRow[]> {
  const [rows] = (await knex
    .raw(sql, bindings as Knex.RawBinding[])
    .options(ROW_OPTIONS)) as unknown as [RawRow[]];
  return rows;
}

/** Recomputes rows chain by chain; a chain stops being checked at its first broken row. */
class ChainWalk {
  readonly tails = new Map<string, Head>();
  readonly broken = new Set<string>();
  readonly problems: LedgerProblem[] = [];
  checked = 0;
  private readonly mac: (canonical: string) => string;

  constructor(
    keys: LedgerKeys,
    private readonly anchored: Map<string, Head>,
    private readonly anchorTime: string,
  ) {
    this.mac = fastLedgerMac(keys.entry);
  }

  report(p: LedgerProblem, breaks = true): void {
    if (breaks) this.broken.add(p.chainKey);
    if (this.problems.length < MAX_PROBLEMS) this.problems.push(p);
  }

  private at(r: RawRow, problem: string): void {
    this.report({ id: Number(r[0]), chainKey: r[1], chainSeq: Number(r[2]), problem });
  }

  /** Rows of a page, in id order. */
  rows(batch: RawRow[]): void {
    for (const r of batch) this.row(r);
  }

  /** No closures or objects per row here: this is the verifier's whole cost. */
  row(r: RawRow): void {
    const chainKey = r[1];
    if (this.broken.size > 0 && this.broken.has(chainKey)) return;
    const seq = Number(r[2]);
    let tail = this.tails.get(chainKey);
    const prev = tail ?? { seq: 0, hash: GENESIS_HASH };
    if (seq !== prev.seq + 1) {
      this.at(r, `sequence jumps from ${prev.seq} to ${seq}`);
      return;
    }
    if (r[3] !== prev.hash) {
      this.at(r, "previous-hash link does not match");
      return;
    }
    const canonical = canonicalLedgerEntry(
      chainKey,
      seq,
      r[3],
      r[5],
      r[6],
      r[7],
      r[8],
      r[9],
      r[10],
      r[11],
      r[12],
      r[13],
      r[14],
      r[15],
    );
    if (this.mac(canonical) !== r[4]) {
      const unkeyed = createHash("sha256").update(canonical).digest("hex") === r[4];
      this.at(
        r,
        unkeyed
          ? "row was hashed without the ledger key: it was not written by the application"
          : "row content does not match its keyed hash",
      );
      return;
    }
    const a = this.anchored.size > 0 ? this.anchored.get(chainKey) : undefined;
    if (a && a.seq === seq && a.hash !== r[4]) {
      this.at(r, `row differs from the one anchored at ${this.anchorTime}: rewritten since`);
      return;
    }
    if (tail) {
      tail.seq = seq;
      tail.hash = r[4];
    } else {
      tail = { seq, hash: r[4] };
      this.tails.set(chainKey, tail);
    }
    this.checked += 1;
  }
}

/** What the anchor says against what the database holds now: deleted, rewound or truncated chains. */
function anchorProblems(
  chainKey: string,
  anchored: Head,
  head: Head | undefined,
  lastStoredSeq: number,
  anchorTime: string,
): LedgerProblem[] {
  const problems: LedgerProblem[] = [];
  const at = (problem: string) =>
    problems.push({ id: 0, chainKey, chainSeq: anchored.seq, problem });
  if (!head) {
    at(`chain head was deleted (the anchor of ${anchorTime} recorded row ${anchored.seq})`);
  } else if (head.seq < anchored.seq) {
    at(
      `chain head was rewound to row ${head.seq} (the anchor of ${anchorTime} recorded row ${anchored.seq})`,
    );
  }
  if (lastStoredSeq < anchored.seq) {
    at(
      `chain ends at row ${lastStoredSeq} but the anchor of ${anchorTime} recorded row ${anchored.seq}: rows were removed from its tail`,
    );
  }
  return problems;
}

/** The head must name the chain's last stored row; a chain with rows must have a head. */
function headProblem(chainKey: string, head: Head | undefined, tail: Head): LedgerProblem | null {
  if (!head) {
    return tail.seq > 0
      ? {
          id: 0,
          chainKey,
          chainSeq: tail.seq,
          problem: `chain head is missing (deleted); its rows run to ${tail.seq}`,
        }
      : null;
  }
  if (head.seq !== tail.seq) {
    return {
      id: 0,
      chainKey,
      chainSeq: tail.seq + 1,
      problem: `chain head expects row ${head.seq}, last stored row is ${tail.seq}`,
    };
  }
  if (head.hash !== tail.hash) {
    return {
      id: 0,
      chainKey,
      chainSeq: tail.seq,
      problem: `chain head's hash does not match row ${tail.seq}`,
    };
  }
  return null;
}

async function readHeads(knex: Knex): Promise<Map<string, Head>> {
  const [rows] = (await knex
    .raw("SELECT chain_key, last_seq, last_hash FROM ledger_chains")
    .options({ rowsAsArray: true })) as unknown as [[string, number | string, string][]];
  return new Map(rows.map(([k, seq, hash]) => [k, { seq: Number(seq), hash }]));
}

/** What this walk needs of mysql2's connection: a query whose rows arrive as events. */
type RowEvents = {
  on(event: "result", listener: (row: RawRow) => void): RowEvents;
  on(event: "error", listener: (error: Error) => void): RowEvents;
  on(event: "end", listener: () => void): RowEvents;
};
type RawConnection = {
  query(options: { sql: string } & typeof ROW_OPTIONS): RowEvents;
};
type ConnectionSource = {
  acquireConnection(): Promise<RawConnection>;
  releaseConnection(connection: RawConnection): Promise<void>;
};

/**
 * One query, each row checked as mysql2 parses it rather than pages collected
 * into arrays: the database keeps sending while this thread hashes (the socket
 * buffer is the only queue), rows die young so garbage collection stays cheap,
 * and the event loop is never held for more than one socket read's rows.
 */
async function walkAll(knex: Knex, walk: ChainWalk): Promise<void> {
  // In the verify transaction this is the transaction's connection, and releasing it is a no-op.
  const client = knex.client as ConnectionSource;
  const connection = await client.acquireConnection();
  try {
    await new Promise<void>((resolve, reject) => {
      let failed: Error | null = null;
      connection
        .query({ sql: `SELECT ${COLUMNS} FROM ledger_entries ORDER BY id`, ...ROW_OPTIONS })
        .on("result", (row) => {
          if (failed) return;
          try {
            walk.row(row);
          } catch (error) {
            failed = error instanceof Error ? error : new Error(String(error));
          }
        })
        .on("error", reject)
        .on("end", () => (failed ? reject(failed) : resolve()));
    });
  } finally {
    await client.releaseConnection(connection);
  }
}

/**
 * Rows after `from` for the given chains. Small chains share one query (their
 * row count is known from the last stored sequence); a long one is paged.
 */
async function walkAfter(
  knex: Knex,
  walk: ChainWalk,
  chains: { chainKey: string; from: number; lastSeq: number }[],
  batchSize: number,
): Promise<void> {
  let group: typeof chains = [];
  let groupRows = 0;
  const flush = async () => {
    if (group.length === 0) return;
    const where = group.map(() => "(chain_key = ? AND chain_seq > ?)").join(" OR ");
    walk.rows(
      await rawRows(
        knex,
        `SELECT ${COLUMNS} FROM ledger_entries WHERE ${where} ORDER BY chain_key, chain_seq`,
        group.flatMap((c) => [c.chainKey, c.from]),
      ),
    );
    group = [];
    groupRows = 0;
  };
  for (const c of chains) {
    const rows = c.lastSeq - c.from;
    if (rows > batchSize) {
      for (let from = c.from; from < c.lastSeq; from += batchSize) {
        walk.rows(
          await rawRows(
            knex,
            `SELECT ${COLUMNS} FROM ledger_entries WHERE chain_key = ? AND chain_seq > ? ORDER BY chain_seq LIMIT ?`,
            [c.chainKey, from, batchSize],
          ),
        );
      }
      continue;
    }
    if (groupRows + rows > batchSize || group.length >= 500) await flush();
    group.push(c);
    groupRows += rows;
  }
  await flush();
}

export type VerifiedSnapshot = {
  result: LedgerVerification;
  /** The chain heads as read in the verified snapshot (what a new anchor records). */
  heads: AnchorHead[];
  database: string;
};

/**
 * Verifies inside one REPEATABLE READ transaction (it only reads), so rows, heads
 * and what gets anchored all come from one snapshot: a write committed during
 * the walk is neither half-seen nor reported as a broken head.
 */
export async function verifySnapshot(
  knex: Knex,
  anchorRead: AnchorRead,
  opts: Omit<VerifyOptions, "anchorPath"> = {},
): Promise<VerifiedSnapshot> {
  if (!knex.isTransaction) {
    return knex.transaction((trx) => verifySnapshot(trx, anchorRead, opts), {
      // Not `readOnly`: knex writes "… REPEATABLE READ READ ONLY", which MariaDB refuses.
      isolationLevel: "repeatable read",
    });
  }
  const keys = opts.keys ?? ledgerKeys();
  const batchSize = opts.batchSize ?? 20_000;
  const [[dbRow]] = (await knex.raw("SELECT DATABASE() AS name")) as unknown as [
    [{ name: string }],
  ];
  const database = dbRow.name;

  const leading: LedgerProblem[] = [];
  let anchor = anchorRead.status === "ok" ? anchorRead.anchor : null;
  if (anchorRead.status === "invalid") {
    leading.push({ id: 0, chainKey: "(anchor)", chainSeq: 0, problem: anchorRead.problem });
  }
  if (anchor && anchor.database !== database) {
    leading.push({
      id: 0,
      chainKey: "(anchor)",
      chainSeq: 0,
      problem: `the anchor was written for database ${anchor.database}, not ${database}`,
    });
    anchor = null;
  }
  const anchored = new Map<string, Head>(anchor?.heads.map(([k, seq, hash]) => [k, { seq, hash }]));
  const anchorTime = anchor?.createdAt ?? "";
  const mode = opts.mode === "incremental" && anchor ? "incremental" : "full";
  const walk = new ChainWalk(keys, anchored, anchorTime);
  for (const p of leading) walk.report(p, false);

  const heads = await readHeads(knex);
  if (mode === "full") {
    await walkAll(knex, walk);
    for (const [k, a] of anchored) {
      if (walk.broken.has(k)) continue;
      const found = anchorProblems(k, a, heads.get(k), walk.tails.get(k)?.seq ?? 0, anchorTime);
      for (const p of found) walk.report(p);
    }
  } else {
    // The last stored row of every chain, read from the (chain_key, chain_seq)
    // index one chain at a time rather than by scanning the table.
    const [lastRows] = (await knex
      .raw("SELECT chain_key, MAX(chain_seq) FROM ledger_entries GROUP BY chain_key")
      .options({ rowsAsArray: true })) as unknown as [[string, number | string][]];
    const lastSeq = new Map(lastRows.map(([k, seq]) => [k, Number(seq)]));
    for (const [k, a] of anchored) {
      for (const p of anchorProblems(k, a, heads.get(k), lastSeq.get(k) ?? 0, anchorTime))
        walk.report(p);
    }
    const toWalk: { chainKey: string; from: number; lastSeq: number }[] = [];
    for (const k of new Set([...heads.keys(), ...lastSeq.keys()])) {
      if (walk.broken.has(k)) continue;
      const a = anchored.get(k);
      if (a) walk.tails.set(k, { seq: a.seq, hash: a.hash });
      const from = a?.seq ?? 0;
      const last = Math.max(lastSeq.get(k) ?? 0, heads.get(k)?.seq ?? 0);
      if (last > from) toWalk.push({ chainKey: k, from, lastSeq: last });
    }
    await walkAfter(knex, walk, toWalk, batchSize);
  }
  for (const k of new Set([...heads.keys(), ...walk.tails.keys()])) {
    if (walk.broken.has(k)) continue;
    const p = headProblem(k, heads.get(k), walk.tails.get(k) ?? { seq: 0, hash: GENESIS_HASH });
    if (p) walk.report(p);
  }

  const problems = walk.problems;
  return {
    result: {
      ok: problems.length === 0,
      checked: walk.checked,
      firstBroken: problems[0] ?? null,
      problems,
      mode,
      anchor: anchor ? { createdAt: anchor.createdAt, chains: anchor.heads.length } : null,
    },
    heads: [...heads].map(([k, h]): AnchorHead => [k, h.seq, h.hash]),
    database,
  };
}

/**
 * Walks every chain (or, incremental, only what follows the last anchor),
 * recomputing each row's keyed hash and its link to the previous row; compares
 * the chain heads with the rows and with the last anchor written outside the
 * database, so a forged row, a truncated tail, a rewound or a deleted head is
 * reported with its chain.
 */
export async function verifyLedger(
  knex: Knex,
  opts: VerifyOptions = {},
): Promise<LedgerVerification> {
  const keys = opts.keys ?? ledgerKeys();
  const anchorPath = opts.anchorPath === undefined ? ledgerAnchorPath() : opts.anchorPath;
  const anchorRead: AnchorRead = anchorPath
    ? await readAnchorFile(anchorPath, keys)
    : { status: "none" };
  return (await verifySnapshot(knex, anchorRead, { ...opts, keys })).result;
}

/** The unit a patient chain belongs to (the patient's latest admission); null for other chains. */
export async function chainUnitId(knex: Knex, chainKey: string): Promise<number | null> {
  const patientId = /^patient:(\d+)$/.exec(chainKey)?.[1];
  if (!patientId) return null;
  const row = (await knex("admissions as a")
    .join("beds as b", "b.id", "a.bed_id")
    .where("a.patient_id", Number(patientId))
    .orderBy("a.admitted_at", "desc")
    .first("b.unit_id")) as { unit_id: number } | undefined;
  return row?.unit_id ?? null;
}

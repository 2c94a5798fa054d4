import type { Knex } from "knex";
import { readAnchorFile, signAnchor, writeAnchorFile, type LedgerAnchor } from "./anchor-file";
import type { LedgerKeys } from "./hash";
import { ledgerAnchorPath, ledgerKeys } from "./keys";
import { verifySnapshot, type LedgerVerification } from "./verify";

export type AnchorOutcome = {
  written: boolean;
  path: string;
  verification: LedgerVerification;
  anchor: LedgerAnchor | null;
  /** Why no anchor was written. */
  reason?: string;
};

/**
 * Writes a new signed anchor of every chain head — but only after the ledger
 * verified from the previous anchor (incrementally; in full the first time),
 * in the same snapshot the heads are read from. A tampered ledger is therefore
 * never blessed: the last good anchor stays and keeps reporting the damage. An
 * anchor file that does not verify is left in place as evidence.
 */
export async function anchorLedger(
  knex: Knex,
  opts: { path?: string; keys?: LedgerKeys; now?: Date } = {},
): Promise<AnchorOutcome> {
  const keys = opts.keys ?? ledgerKeys();
  const file = opts.path ?? ledgerAnchorPath();
  const previous = await readAnchorFile(file, keys);
  const { result, heads, database } = await verifySnapshot(knex, previous, {
    mode: "incremental",
    keys,
  });
  if (!result.ok) {
    return {
      written: false,
      path: file,
      verification: result,
      anchor: null,
      reason:
        previous.status === "invalid"
          ? "the existing anchor does not verify; move it aside after investigating"
          : "the ledger does not verify against the last anchor",
    };
  }
  heads.sort((a, b) => (a[0] < b[0] ? -1 : a[0] > b[0] ? 1 : 0));
  const anchor = signAnchor(keys, { database, createdAt: opts.now ?? new Date(), heads });
  await writeAnchorFile(file, anchor);
  return { written: true, path: file, verification: result, anchor };
}

/**
 * Anchors at start and then every `intervalMs` until stopped (the alert
 * worker runs it). A failing pass is logged and retried; passes never overlap.
 */
export function startLedgerAnchoring(
  knex: Knex,
  opts: { intervalMs: number; path?: string; log?: (line: string) => void },
): { stop(): Promise<void> } {
  const log = opts.log ?? ((line: string) => console.log(line));
  let stopped = false;
  let timer: NodeJS.Timeout | undefined;
  let running: Promise<void> = Promise.resolve();
  const tick = () => {
    running = anchorLedger(knex, { path: opts.path })
      .then((outcome) => {
        if (outcome.written) return;
        const broken = outcome.verification.firstBroken;
        log(
          `[ledger] NOT anchored: ${outcome.reason ?? "unknown"}` +
            (broken
              ? ` — chain ${broken.chainKey}, row ${broken.chainSeq}: ${broken.problem}`
              : ""),
        );
      })
      .catch((error: unknown) =>
        log(`[ledger] anchor failed: ${error instanceof Error ? error.message : String(error)}`),
      )
      .finally(() => {
        if (!stopped) timer = setTimeout(tick, opts.intervalMs);
      });
  };
  tick();
  return {
    async stop() {
      stopped = true;
      if (timer) clearTimeout(timer);
      await running;
    },
  };
}

import type { Knex } from "knex";
import { isDbError } from "./db-errors";
import { ConflictError } from "./errors";

const ATTEMPTS = 8;
const MAX_DELAY_MS = 1000;

/**
 * Errors after which the whole transaction was rolled back and may simply run
 * again:
 * - ER_LOCK_DEADLOCK (1213): an InnoDB deadlock victim, and on Galera a
 *   certification failure — two nodes committed conflicting rows at once and
 *   this one lost (normal under multi-primary writes, reported at COMMIT);
 * - ER_UNKNOWN_COM_ERROR (1047) "WSREP has not yet prepared node": the node
 *   left the primary component; the load balancer cuts its connections within
 *   about two seconds and the next attempt reaches another node.
 * A lost connection is not retried here: the COMMIT may have landed, and only
 * the client's idempotency key can tell.
 */
export function isRetryable(error: unknown): boolean {
  if (!isDbError(error)) return false;
  return (
    error.code === "ER_LOCK_DEADLOCK" ||
    (error.errno === 1047 && /wsrep/i.test(error.sqlMessage ?? ""))
  );
}

export type TransactOptions = {
  /** Named in the log line when a retry was needed. */
  label?: string;
  config?: Knex.TransactionConfig;
  attempts?: number;
  log?: (line: string) => void;
};

/**
 * Runs `write` in one transaction, again as a whole after a retryable failure,
 * with exponential backoff and jitter (so two losers do not meet again) and a
 * bound: a lasting conflict surfaces as 409 with nothing saved. Every retry is
 * logged with its count, so a cluster's conflict rate can be read off the logs.
 * The callback must be safe to run twice: database work only, no e-mail sent
 * from inside it, no counters outside it.
 */
export async function transact<T>(
  knex: Knex,
  write: (trx: Knex.Transaction) => Promise<T>,
  opts: TransactOptions = {},
): Promise<T> {
  const attempts = opts.attempts ?? ATTEMPTS;
  const log = opts.log ?? ((line: string) => console.warn(line));
  for (let attempt = 1; ; attempt += 1) {
    try {
      const result = await knex.transaction(write, opts.config);
      if (attempt > 1) {
        log(
          `[db] ${opts.label ?? "transaction"} committed after ${attempt - 1} retr${attempt === 2 ? "y" : "ies"}`,
        );
      }
      return result;
    } catch (error) {
      if (!isRetryable(error)) throw error;
      if (attempt >= attempts) {
        log(
          `[db] ${opts.label ?? "transaction"} gave up after ${attempt} attempts: ${String((error as Error).message)}`,
        );
        throw new ConflictError(
          "The record was busy with another change; nothing was saved. Try again.",
        );
      }
      const delay = Math.min(MAX_DELAY_MS, 10 * 2 ** attempt) * (0.5 + Math.random());
      await new Promise((resolve) => setTimeout(resolve, delay));
    }
  }
}

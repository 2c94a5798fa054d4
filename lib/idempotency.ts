import type { Knex } from "knex";
import { isDbError } from "./db-errors";
import { ConflictError } from "./errors";

const DEADLOCK_ATTEMPTS = 6;

/**
 * Runs a transaction again when InnoDB chose it as a deadlock victim: two
 * first writes on neighbouring index gaps (two patients' first orders or
 * first alerts) can lock each other out although neither conflicts. The
 * victim was rolled back whole, so running it again is safe; a lasting
 * conflict still surfaces after the last attempt.
 */
async function retryDeadlock<T>(run: () => Promise<T>): Promise<T> {
  for (let attempt = 1; ; attempt += 1) {
    try {
      return await run();
    } catch (error) {
      if (!(isDbError(error) && error.code === "ER_LOCK_DEADLOCK")) throw error;
      if (attempt >= DEADLOCK_ATTEMPTS)
        throw new ConflictError(
          "The record was busy with another change; nothing was saved. Try again.",
        );
      // Exponential backoff with jitter, so the victims of one deadlock do not meet again.
      await new Promise((resolve) =>
        setTimeout(resolve, 10 * 2 ** attempt * (0.5 + Math.random())),
      );
    }
  }
}

/** Carries the stored result out of the rolled-back transaction. */
class Replay extends Error {
  constructor(readonly response: unknown) {
    super("idempotent replay");
  }
}

/**
 * Runs `write` in one transaction, at most once per (user, key). The key row is
 * inserted first: a concurrent duplicate blocks on it until the first commits,
 * then finds it taken and returns the first result instead of writing again.
 * Without a key the write simply runs. A deadlock victim is run again.
 */
export async function once<T>(
  knex: Knex,
  userId: number,
  key: string | undefined,
  operation: string,
  write: (trx: Knex.Transaction) => Promise<T>,
): Promise<T> {
  if (!key) return retryDeadlock(() => knex.transaction(write));
  try {
    return await retryDeadlock(() =>
      knex.transaction(async (trx) => {
        try {
          await trx("idempotency_keys").insert({
            user_id: userId,
            idem_key: key,
            operation,
            response_json: "null",
          });
        } catch (error) {
          if (isDbError(error) && error.code === "ER_DUP_ENTRY") {
            const stored = (await trx("idempotency_keys")
              .where({ user_id: userId, idem_key: key })
              .first("operation", "response_json")) as { operation: string; response_json: string };
            // The same key sent earlier with another kind of write: a client error, not a replay.
            if (stored.operation !== operation) {
              throw new ConflictError(
                "This idempotency key was already used for a different kind of write; send a new key.",
                { idempotencyKey: ["Already used for a different kind of write."] },
              );
            }
            throw new Replay(JSON.parse(stored.response_json));
          }
          throw error;
        }
        const result = await write(trx);
        await trx("idempotency_keys")
          .where({ user_id: userId, idem_key: key })
          .update({ response_json: JSON.stringify(result) });
        return result;
      }),
    );
  } catch (error) {
    if (error instanceof Replay) return error.response as T;
    throw error;
  }
}

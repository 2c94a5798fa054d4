import type { Knex } from "knex";
import { isDbError } from "./db-errors";
import { ConflictError } from "./errors";
import { transact } from "./transaction";

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
 * Without a key the write simply runs. A deadlock victim (or, on Galera, the
 * loser of a certification conflict) is run again as a whole.
 */
export async function once<T>(
  knex: Knex,
  userId: number,
  key: string | undefined,
  operation: string,
  write: (trx: Knex.Transaction) => Promise<T>,
): Promise<T> {
  if (!key) return transact(knex, write, { label: operation });
  try {
    return await transact(
      knex,
      async (trx) => {
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
      },
      { label: operation },
    );
  } catch (error) {
    if (error instanceof Replay) return error.response as T;
    throw error;
  }
}

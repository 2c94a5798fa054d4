import type { Knex } from "knex";
import type { z } from "zod";
import type { Actor } from "../auth/actor";
import { assertCan, type Permission } from "../auth/permissions";
import { parseInput } from "../validation";

/**
 * One operation of the product, defined once: who may (a row of the permission
 * table), the noun's schema, and the service that runs it on parsed, typed
 * input. The route handler and the server action are produced from this
 * definition (lib/boundary/next.ts), so an input is parsed once and the role
 * is checked once, at the door; the service checks only what needs the record
 * (the patient's unit, the device in use).
 *
 * Framework-free, so tests and scripts call `invoke` with the same checks.
 */
export type Operation<S extends z.ZodType, R> = {
  permission: Permission;
  schema: S;
  /** `now` is the clock: tests and the demo seed pass one, the door never does. */
  run(knex: Knex, actor: Actor, input: z.output<S>, now?: Date): Promise<R>;
};

export type DefinedOperation<S extends z.ZodType, R> = Operation<S, R> & {
  kind: "write" | "read";
  /** Role check → parse → run: the door's checks without the session. */
  invoke(knex: Knex, actor: Actor, raw: unknown, now?: Date): Promise<R>;
};

function define<S extends z.ZodType, R>(
  kind: "write" | "read",
  operation: Operation<S, R>,
): DefinedOperation<S, R> {
  return {
    ...operation,
    kind,
    // async, so a refusal is a rejected promise like every other failure
    async invoke(knex, actor, raw, now) {
      assertCan(actor, operation.permission);
      return operation.run(knex, actor, parseInput(operation.schema, raw), now);
    },
  };
}

/** A change: a JSON body (plus path ids) in, one transaction with its ledger row. */
export function defineWrite<S extends z.ZodType, R>(operation: Operation<S, R>) {
  return define("write", operation);
}

/** A read: the query string (plus path ids) in, nothing written. */
export function defineRead<S extends z.ZodType, R>(operation: Operation<S, R>) {
  return define("read", operation);
}

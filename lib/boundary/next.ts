import { revalidatePath } from "next/cache";
import { NextResponse } from "next/server";
import type { z } from "zod";
import { runAction, type ActionResult } from "../action-result";
import { requirePermission } from "../auth/guard";
import { db } from "../db";
import { handleRoute, idParam, readOptionalWriteBody, readWriteBody } from "../http";
import { consumeQuota, type QuotaBucket } from "../rate-limit";
import { parseInput } from "../validation";
import type { DefinedOperation } from "./operation";

// The framework edge of an operation: session → permission → parse once →
// the service → one result shape (ActionResult for actions, the JSON error
// shape of lib/http.ts for routes). Request hardening (origin, content type)
// runs before this, in middleware.ts.

type RouteContext = { params: Promise<Record<string, string | string[] | undefined>> };

type RouteOptions<R> = {
  /**
   * Path segments that are record ids, parsed as positive integers and folded
   * into the input under the same name, or renamed (`{ userId: "id" }`).
   */
  ids?: readonly string[] | Readonly<Record<string, string>>;
  /** The JSON answer for a result. */
  respond: (result: R) => unknown;
  /** 201 for a create; 200 otherwise. */
  status?: number | ((result: R) => number);
  /** An empty body is allowed and reads as `{}` (steps that need no fields). */
  optionalBody?: boolean;
  /** An expensive request: counted against the user's per-minute quota (429 + Retry-After). */
  quota?: QuotaBucket;
};

/** Path ids win over the body, so a body cannot point a write at another record. */
async function pathIds(ids: RouteOptions<unknown>["ids"], context: RouteContext | undefined) {
  if (!ids) return {};
  const names: [string, string][] = Array.isArray(ids)
    ? ids.map((name: string) => [name, name])
    : Object.entries(ids);
  const params = (await context?.params) ?? {};
  const out: Record<string, number> = {};
  for (const [name, field] of names) {
    out[field] = (parseInput(idParam(name), params) as Record<string, number>)[name]!;
  }
  return out;
}

/** The route handler of a write: JSON body (capped, Idempotency-Key folded in) + path ids. */
export function writeRoute<S extends z.ZodType, R>(
  operation: DefinedOperation<S, R>,
  options: RouteOptions<R>,
) {
  return (request: Request, context: RouteContext) =>
    handleRoute(async () => {
      const actor = await requirePermission(operation.permission);
      if (options.quota) await consumeQuota(db(), `user:${actor.id}`, options.quota);
      const ids = await pathIds(options.ids, context);
      const body = options.optionalBody
        ? await readOptionalWriteBody(request)
        : await readWriteBody(request);
      const input = parseInput(operation.schema, { ...body, ...ids });
      const result = await operation.run(db(), actor, input);
      const status =
        typeof options.status === "function" ? options.status(result) : (options.status ?? 200);
      return NextResponse.json(options.respond(result), { status });
    });
}

/**
 * The route handler of a read: query string (last value of a repeated key) +
 * path ids. Clinical reads are never cached by the browser or a proxy.
 */
export function readRoute<S extends z.ZodType, R>(
  operation: DefinedOperation<S, R>,
  options: Omit<RouteOptions<R>, "optionalBody" | "status">,
) {
  return (request: Request, context: RouteContext) =>
    handleRoute(async () => {
      const actor = await requirePermission(operation.permission);
      if (options.quota) await consumeQuota(db(), `user:${actor.id}`, options.quota);
      const ids = await pathIds(options.ids, context);
      const query = Object.fromEntries(new URL(request.url).searchParams);
      const input = parseInput(operation.schema, { ...query, ...ids });
      return NextResponse.json(options.respond(await operation.run(db(), actor, input)), {
        headers: { "cache-control": "no-store" },
      });
    });
}

/** A path to refresh, or a route pattern with its kind (`["/patients/[patientId]", "page"]`). */
export type Revalidation = string | [path: string, type: "page" | "layout"];

/**
 * The body of a server action. An action is a public POST endpoint, so it runs
 * the same door as the route; `revalidate` names the pages the change shows on.
 */
export function runWriteAction<S extends z.ZodType, R>(
  operation: DefinedOperation<S, R>,
  raw: unknown,
  revalidate: (result: R, input: z.output<S>) => readonly Revalidation[] = () => [],
): Promise<ActionResult<R>> {
  return runAction(async () => {
    const actor = await requirePermission(operation.permission);
    const input = parseInput(operation.schema, raw);
    const result = await operation.run(db(), actor, input);
    for (const page of revalidate(result, input)) {
      if (typeof page === "string") revalidatePath(page);
      else revalidatePath(...page);
    }
    return result;
  });
}

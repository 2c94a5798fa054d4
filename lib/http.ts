import { NextResponse } from "next/server";
import { z } from "zod";
import { DomainError, fromEngineError, TooManyRequestsError } from "./errors";

/** The one JSON error shape of the API. */
export type ApiError = { error: { message: string; fieldErrors?: Record<string, string[]> } };

export function errorResponse(thrown: unknown): NextResponse<ApiError> {
  const error = fromEngineError(thrown) ?? thrown;
  if (error instanceof DomainError) {
    return NextResponse.json(
      {
        error: {
          message: error.message,
          ...(error.fieldErrors ? { fieldErrors: error.fieldErrors } : {}),
        },
      },
      {
        status: error.status,
        ...(error instanceof TooManyRequestsError
          ? { headers: { "retry-after": String(error.retryAfterSeconds) } }
          : {}),
      },
    );
  }
  console.error("[api] unexpected error", error);
  return NextResponse.json(
    { error: { message: "Something went wrong on our side; nothing was saved." } },
    { status: 500 },
  );
}

/** Wraps a route handler body so every failure leaves through errorResponse. */
export async function handleRoute(body: () => Promise<Response>): Promise<Response> {
  try {
    return await body();
  } catch (error) {
    return errorResponse(error);
  }
}

/**
 * Reads a request body as bytes, chunk by chunk, refusing it (413) as soon as
 * it passes `maxBytes` rather than after buffering all of it.
 */
function sizeWords(bytes: number): string {
  return bytes >= 1024 * 1024
    ? `${Math.round(bytes / 1024 / 1024)} MB`
    : `${Math.round(bytes / 1024)} KB`;
}

export async function readBodyBytes(request: Request, maxBytes: number): Promise<Buffer> {
  if (!request.body) return Buffer.alloc(0);
  const declared = Number(request.headers.get("content-length") ?? "0");
  if (declared > maxBytes)
    throw new DomainError(`The body is larger than ${sizeWords(maxBytes)}.`, 413);
  const chunks: Buffer[] = [];
  let size = 0;
  const reader = request.body.getReader();
  for (;;) {
    const { done, value } = await reader.read();
    if (done) break;
    size += value.byteLength;
    if (size > maxBytes) {
      await reader.cancel();
      throw new DomainError(`The body is larger than ${sizeWords(maxBytes)}.`, 413);
    }
    // A view, not a copy: the cap holds what it has read, once.
    chunks.push(Buffer.from(value.buffer, value.byteOffset, value.byteLength));
  }
  return Buffer.concat(chunks, size);
}

/** Reads a JSON body with a size cap; malformed or oversized bodies are a 400/413. */
export async function readJson(request: Request, maxBytes = 64 * 1024): Promise<unknown> {
  const text = (await readBodyBytes(request, maxBytes)).toString("utf8");
  try {
    return JSON.parse(text) as unknown;
  } catch {
    throw new DomainError("Request body is not valid JSON.", 400);
  }
}

/** Reads a JSON object body and folds in an `Idempotency-Key` header, if sent. */
export async function readWriteBody(request: Request): Promise<Record<string, unknown>> {
  return asWriteBody(request, await readJson(request));
}

/** As readWriteBody, but an empty body reads as `{}` (steps whose fields are all optional). */
export async function readOptionalWriteBody(request: Request): Promise<Record<string, unknown>> {
  const text = (await readBodyBytes(request, 64 * 1024)).toString("utf8");
  if (!text.trim()) return asWriteBody(request, {});
  try {
    return asWriteBody(request, JSON.parse(text) as unknown);
  } catch {
    throw new DomainError("Request body is not valid JSON.", 400);
  }
}

function asWriteBody(request: Request, body: unknown): Record<string, unknown> {
  if (typeof body !== "object" || body === null || Array.isArray(body)) {
    throw new DomainError("Request body must be a JSON object.", 400);
  }
  const key = request.headers.get("idempotency-key");
  return key
    ? { ...(body as Record<string, unknown>), idempotencyKey: key }
    : (body as Record<string, unknown>);
}

/** Route params are validated like any other input. */
export const idParam = (name: string) =>
  z.object({
    [name]: z.coerce.number().int().positive(`${name} must be a positive whole number.`),
  });

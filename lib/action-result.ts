import { DomainError, fromEngineError, type FieldErrors } from "./errors";

/** The one result type every server action returns. */
export type ActionResult<T> =
  { ok: true; data: T } | { ok: false; status: number; message: string; fieldErrors?: FieldErrors };

/**
 * Runs an action body and turns domain errors into a typed failure; anything
 * unexpected is logged and reported without internals.
 */
export async function runAction<T>(body: () => Promise<T>): Promise<ActionResult<T>> {
  try {
    return { ok: true, data: await body() };
  } catch (thrown) {
    const error = fromEngineError(thrown) ?? thrown;
    if (error instanceof DomainError) {
      return {
        ok: false,
        status: error.status,
        message: error.message,
        ...(error.fieldErrors ? { fieldErrors: error.fieldErrors } : {}),
      };
    }
    console.error("[action] unexpected error", error);
    return {
      ok: false,
      status: 500,
      message: "Something went wrong on our side; nothing was saved.",
    };
  }
}

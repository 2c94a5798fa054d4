/** A refusal or failure of the JSON API, in words a person can act on. */
export class ApiRequestError extends Error {
  constructor(
    message: string,
    readonly status: number,
  ) {
    super(message);
    this.name = "ApiRequestError";
  }
}

function apiMessage(body: unknown): string | undefined {
  if (typeof body !== "object" || body === null || !("error" in body)) return undefined;
  const error = (body as { error: unknown }).error;
  if (typeof error !== "object" || error === null || !("message" in error)) return undefined;
  const { message } = error as { message: unknown };
  return typeof message === "string" ? message : undefined;
}

/**
 * GETs JSON from /api/v1 for SWR; every failure becomes an ApiRequestError.
 * `what` names the page in the session-ended message ("the ledger", "the Chart").
 */
export async function getApiJson<T>(url: string, what: string): Promise<T> {
  let response: Response;
  try {
    response = await fetch(url, { headers: { accept: "application/json" }, cache: "no-store" });
  } catch {
    throw new ApiRequestError(
      "Tidemark could not be reached. Check the connection and try again.",
      0,
    );
  }
  const body: unknown = await response.json().catch(() => null);
  if (!response.ok) {
    if (response.status === 401) {
      throw new ApiRequestError(`Your session has ended. Sign in again to read ${what}.`, 401);
    }
    throw new ApiRequestError(
      apiMessage(body) ?? `The server could not answer (status ${response.status}). Try again.`,
      response.status,
    );
  }
  if (body === null)
    throw new ApiRequestError("The server's answer could not be read. Try again.", response.status);
  return body as T;
}

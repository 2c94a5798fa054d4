/** POSTs JSON to one of the account routes; the answer or the API's error in words. */
export async function postJson(
  url: string,
  body: unknown,
): Promise<
  | { ok: true; data: Record<string, unknown> }
  | { ok: false; message: string; fieldErrors: Record<string, string[]> }
> {
  let response: Response;
  try {
    response = await fetch(url, {
      method: "POST",
      headers: { "content-type": "application/json", accept: "application/json" },
      body: JSON.stringify(body),
    });
  } catch {
    return {
      ok: false,
      message: "Tidemark could not be reached. Check the connection and try again.",
      fieldErrors: {},
    };
  }
  const json = (await response.json().catch(() => null)) as Record<string, unknown> | null;
  if (response.ok) return { ok: true, data: json ?? {} };
  const error = (json?.error ?? {}) as { message?: string; fieldErrors?: Record<string, string[]> };
  return {
    ok: false,
    message: error.message ?? `The server could not answer (status ${response.status}). Try again.`,
    fieldErrors: error.fieldErrors ?? {},
  };
}

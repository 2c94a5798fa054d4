import type { ImportPreview } from "@/lib/imports/report";

// The upload page's requests to /api/v1/imports, answered as a preview or a
// failure in words (and field errors) the page shows.

export const rows = (n: number, noun: string) => `${n} ${noun}${n === 1 ? "" : "s"}`;

export type ApiFailure = { message: string; fieldErrors: Record<string, string[]> };

export async function send(
  url: string,
  init: RequestInit,
): Promise<{ ok: true; preview: ImportPreview } | ({ ok: false } & ApiFailure)> {
  let response: Response;
  try {
    response = await fetch(url, {
      ...init,
      headers: { accept: "application/json", ...(init.headers ?? {}) },
    });
  } catch {
    return {
      ok: false,
      message: "Tidemark could not be reached. Check the connection and try again.",
      fieldErrors: {},
    };
  }
  const body = (await response.json().catch(() => null)) as {
    import?: ImportPreview;
    error?: { message?: string; fieldErrors?: Record<string, string[]> };
  } | null;
  if (response.ok && body?.import) return { ok: true, preview: body.import };
  if (response.status === 401)
    return {
      ok: false,
      message: "Your session has ended. Sign in again to upload.",
      fieldErrors: {},
    };
  return {
    ok: false,
    message:
      body?.error?.message ?? `The server could not answer (status ${response.status}). Try again.`,
    fieldErrors: body?.error?.fieldErrors ?? {},
  };
}

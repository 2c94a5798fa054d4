import { getApiJson } from "@/components/ui/api-json";
import type { FieldErrors } from "@/lib/errors";
import type { RehearsalCreateData } from "@/lib/rehearsal/schema";
import type { RehearsalListItem, RehearsalView } from "@/lib/rehearsal/views";

// The Rehearsal page's requests to /api/v1/rehearsals: the unit's runs, one
// run (polled while the worker has it) and a new run.

export const listUrl = (unitId: number) => `/api/v1/rehearsals?unitId=${unitId}`;
export const runUrl = (rehearsalId: number) => `/api/v1/rehearsals/${rehearsalId}`;

export const fetchRuns = (url: string) =>
  getApiJson<{ rehearsals: RehearsalListItem[] }>(url, "the rehearsals").then((b) => b.rehearsals);

export const fetchRun = (url: string) =>
  getApiJson<{ rehearsal: RehearsalView }>(url, "the rehearsal").then((b) => b.rehearsal);

export type RunRefusal = { status: number; message: string; fieldErrors?: FieldErrors };

function readRefusal(body: unknown, status: number): RunRefusal {
  const error =
    typeof body === "object" && body !== null && "error" in body
      ? (body as { error: unknown }).error
      : null;
  const { message, fieldErrors } =
    typeof error === "object" && error !== null
      ? (error as { message?: unknown; fieldErrors?: unknown })
      : {};
  return {
    status,
    message:
      typeof message === "string"
        ? message
        : `The server could not answer (status ${status}). Try again.`,
    ...(typeof fieldErrors === "object" && fieldErrors !== null
      ? { fieldErrors: fieldErrors as FieldErrors }
      : {}),
  };
}

/** POST /api/v1/rehearsals: the queued run (202), or the refusal in words with its fields. */
export async function postRehearsal(
  input: RehearsalCreateData,
): Promise<{ ok: true; rehearsal: RehearsalView } | ({ ok: false } & RunRefusal)> {
  let response: Response;
  try {
    response = await fetch("/api/v1/rehearsals", {
      method: "POST",
      headers: { "content-type": "application/json", accept: "application/json" },
      body: JSON.stringify(input),
    });
  } catch {
    return {
      ok: false,
      status: 0,
      message: "Tidemark could not be reached. Check the connection and try again.",
    };
  }
  const body: unknown = await response.json().catch(() => null);
  if (response.ok && typeof body === "object" && body !== null && "rehearsal" in body)
    return { ok: true, rehearsal: (body as { rehearsal: RehearsalView }).rehearsal };
  return { ok: false, ...readRefusal(body, response.status) };
}

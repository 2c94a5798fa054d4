import { readFileSync } from "node:fs";
import { join } from "node:path";
import { BASE_URL } from "./browser";
import type { Session } from "./http";

/**
 * Server actions over HTTP, as the browser calls them: a POST to a page with
 * `Next-Action: <id>`. The ids come from the build's manifest, found by export
 * name (the modules that hold the actions may move).
 */
type ManifestEntry = { exportedName?: string; workers: Record<string, unknown> };

function manifest(): Record<string, ManifestEntry> {
  const path = join(process.cwd(), ".next/server/server-reference-manifest.json");
  return (JSON.parse(readFileSync(path, "utf8")) as { node: Record<string, ManifestEntry> }).node;
}

/** Every export name the build can call as a server action. */
export function builtActionNames(): string[] {
  return Object.values(manifest())
    .map((e) => e.exportedName)
    .filter((n): n is string => typeof n === "string");
}

export type BuiltAction = { id: string; pages: string[] };

/** The action's id and the app pages it is bundled with ("/patients/[patientId]/readings/new"). */
export function builtAction(exportedName: string): BuiltAction {
  const found = Object.entries(manifest()).filter(([, v]) => v.exportedName === exportedName);
  if (found.length !== 1) {
    throw new Error(`server action ${exportedName}: ${found.length} entries in the build manifest`);
  }
  const [id, entry] = found[0]!;
  const pages = Object.keys(entry.workers)
    .filter((w) => w.startsWith("app/") && w.endsWith("/page"))
    .map((w) =>
      w
        .slice("app".length, -"/page".length)
        .split("/")
        .filter((s) => !/^\(.*\)$/.test(s))
        .join("/"),
    );
  return { id, pages };
}

/**
 * The page to post to: one the action is bundled with (Next runs it there
 * without forwarding), fewest dynamic segments and shortest first, its
 * segments filled from `params`.
 */
export function actionPage(action: BuiltAction, params: Record<string, number>): string {
  const dynamic = (p: string) => (p.match(/\[/g) ?? []).length;
  const depth = (p: string) => p.split("/").length;
  const page = [...action.pages].sort(
    (a, b) => dynamic(a) - dynamic(b) || depth(a) - depth(b) || a.localeCompare(b),
  )[0];
  if (!page) throw new Error(`server action ${action.id} is bundled with no page`);
  return page.replace(/\[(\w+)\]/g, (_, name: string) => {
    if (params[name] === undefined) throw new Error(`no value for [${name}] in ${page}`);
    return String(params[name]);
  });
}

/** What an action call came to: the ActionResult's status (200 when ok), or the HTTP answer when none ran. */
export type ActionOutcome = { status: number; location: string | null; result: unknown };

/** The `{ ok, status?, … }` object in an RSC flight payload, if there is one. */
export function findActionResult(payload: string): { ok: boolean; status?: number } | null {
  for (const line of payload.split("\n")) {
    const colon = line.indexOf(":");
    if (colon < 0) continue;
    let value: unknown;
    try {
      value = JSON.parse(line.slice(colon + 1));
    } catch {
      continue;
    }
    if (
      typeof value === "object" &&
      value !== null &&
      typeof (value as { ok?: unknown }).ok === "boolean"
    ) {
      return value as { ok: boolean; status?: number };
    }
  }
  return null;
}

export async function callAction(
  session: Session,
  action: BuiltAction,
  page: string,
  arg: unknown,
): Promise<ActionOutcome> {
  const res = await session.fetch(page, {
    method: "POST",
    headers: {
      "next-action": action.id,
      "content-type": "text/plain;charset=UTF-8",
      origin: new URL(BASE_URL).origin,
      accept: "text/x-component",
    },
    body: JSON.stringify([arg]),
  });
  const location = res.headers.get("location");
  const text = await res.text();
  if (res.status !== 200) return { status: res.status, location, result: text.slice(0, 300) };
  const result = findActionResult(text);
  if (!result) throw new Error(`no ActionResult in the answer from ${page}: ${text.slice(0, 300)}`);
  return { status: result.ok ? 200 : (result.status ?? 0), location, result };
}

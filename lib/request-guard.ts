/**
 * Cross-site write protection for the JSON API (`/api/v1`), checked in the
 * middleware before any route runs. `request.origin` is the origin the
 * browser addressed (from the Host header, which a page elsewhere cannot set). A browser attaches the session cookie to
 * any request, even one a page on another site makes ("a form posting
 * text/plain to us"), so a write carried by a cookie session must come from
 * an allowed Origin (or, without Origin, not from another site by
 * Sec-Fetch-Site) and must be JSON — or multipart for the upload, the one
 * form a page of ours posts. Interface engines authenticate with a bearer
 * token and send no session cookie: they are not affected.
 *
 * Pure and edge-safe (no Node imports): the middleware runs on the edge.
 */

const UNSAFE = new Set(["POST", "PUT", "PATCH", "DELETE"]);
const SESSION_COOKIES = ["next-auth.session-token", "__Secure-next-auth.session-token"];

export type Refusal = { status: 403 | 415; message: string };

export function hasSessionCookie(cookieHeader: string | null): boolean {
  if (!cookieHeader) return false;
  return cookieHeader
    .split(";")
    .map((c) => c.trim().split("=")[0])
    .some((name) => SESSION_COOKIES.some((s) => name === s || name?.startsWith(`${s}.`)));
}

/** The origins allowed to write: NEXTAUTH_URL's, and any listed in ALLOWED_ORIGINS. */
export function allowedOrigins(nextAuthUrl: string, extra: string): Set<string> {
  const origins = new Set([new URL(nextAuthUrl).origin]);
  for (const o of extra.split(",")) {
    const trimmed = o.trim();
    if (trimmed) origins.add(new URL(trimmed).origin);
  }
  return origins;
}

export function refuseCrossSiteWrite(
  request: { method: string; pathname: string; headers: Headers; origin: string },
  allowed: Set<string>,
): Refusal | null {
  if (!UNSAFE.has(request.method.toUpperCase())) return null;
  if (!request.pathname.startsWith("/api/v1/")) return null;
  if (!hasSessionCookie(request.headers.get("cookie"))) return null;
  const origin = request.headers.get("origin");
  const site = request.headers.get("sec-fetch-site");
  if (
    origin !== null
      ? !allowed.has(origin)
      : site !== null && site !== "same-origin" && site !== "none"
  ) {
    return {
      status: 403,
      message: `Refused: a write from ${origin ?? "another site"} with this session. Tidemark accepts writes only from its own pages.`,
    };
  }
  const type = (request.headers.get("content-type") ?? "").split(";")[0]!.trim().toLowerCase();
  const upload = request.pathname === "/api/v1/imports" && type === "multipart/form-data";
  if (type !== "application/json" && !upload) {
    return {
      status: 415,
      message: "Send the request body as JSON (Content-Type: application/json).",
    };
  }
  return null;
}

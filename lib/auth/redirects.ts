/**
 * Where the browser may be sent after sign-in: same-origin paths only. A path
 * is parsed as a URL against our own origin (so "/\evil.example", "//evil"
 * and a tab inside "/\t/evil.example" — which browsers read as another host —
 * are caught by the origin check), and control characters and backslashes are
 * refused outright. Anything else goes to the Board.
 */
const FALLBACK = "/board";
const PROBE_ORIGIN = "https://tidemark.invalid";

export function safeCallbackPath(value: string | string[] | undefined | null): string {
  const v = Array.isArray(value) ? value[0] : value;
  if (!v || !v.startsWith("/") || /[\u0000-\u001f\u007f\\]/.test(v)) return FALLBACK;
  try {
    const url = new URL(v, PROBE_ORIGIN);
    if (url.origin !== PROBE_ORIGIN) return FALLBACK;
    return `${url.pathname}${url.search}${url.hash}`;
  } catch {
    return FALLBACK;
  }
}

/** next-auth's redirect callback: the same rule, for absolute URLs on our own origin too. */
export function safeRedirect(url: string, baseUrl: string): string {
  const base = baseUrl.replace(/\/$/, "");
  if (url.startsWith(`${base}/`)) return `${base}${safeCallbackPath(url.slice(base.length))}`;
  return `${base}${safeCallbackPath(url)}`;
}

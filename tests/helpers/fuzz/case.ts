/** One generated request of the API fuzz, and how it is printed when it fails. */

export type Who =
  "physician" | "therapist" | "nurse" | "admin" | "anonymous" | "token" | "badToken";

export type Part =
  { name: string; value: string } | { name: string; fileName: string; content: string };

export type FuzzCase = {
  /** The route as the app names it, e.g. "POST /api/v1/orders/[orderId]/cosign". */
  route: string;
  method: string;
  /** Path and query as sent. */
  path: string;
  who: Who;
  headers: Record<string, string>;
  /** JSON or other text; `bytes`: sent without a content type of fetch's choosing; `parts`: multipart. */
  body?: string | { bytes: string } | { parts: Part[] };
  /** A write built to be refused (the bulk phase asserts a 4xx); reads may answer 2xx. */
  write: boolean;
};

export type Access = { who: Who; headers: Record<string, string>; noType?: boolean };

const clip = (s: string, n = 160) =>
  s.length > n ? `${JSON.stringify(s.slice(0, n))}… (${s.length} chars)` : JSON.stringify(s);

function bodyText(body: FuzzCase["body"]): string {
  if (body === undefined) return "";
  if (typeof body === "string") return ` body=${clip(body)}`;
  if ("bytes" in body) return ` bytes=${clip(body.bytes)}`;
  const parts = body.parts.map((p) =>
    "value" in p
      ? `${p.name}=${clip(p.value, 40)}`
      : `${p.name}=<file ${clip(p.fileName, 30)}: ${clip(p.content, 60)}>`,
  );
  return ` multipart{${parts.join(", ")}}`;
}

/** One line per request: enough to replay it by hand. */
export function describeCase(c: FuzzCase): string {
  const headers = Object.entries(c.headers)
    .map(([k, v]) => `${k}: ${clip(v, 60)}`)
    .join("; ");
  return `${c.method} ${clip(c.path, 200)} as ${c.who} [${headers}]${bodyText(c.body)}`;
}

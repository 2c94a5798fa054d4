import { BASE_URL, DEMO_PASSWORD } from "./browser";

/** A tiny cookie-keeping HTTP client for calling the running app as a given user. */
export class Session {
  private cookies = new Map<string, string>();

  /** `base`: another app than E2E_BASE_URL (the benchmarks compare two). */
  constructor(private readonly base: string = BASE_URL) {}

  private remember(res: Response) {
    for (const line of res.headers.getSetCookie()) {
      const [pair] = line.split(";");
      const eq = pair!.indexOf("=");
      this.cookies.set(pair!.slice(0, eq), pair!.slice(eq + 1));
    }
  }

  async fetch(path: string, init: RequestInit = {}): Promise<Response> {
    const headers = new Headers(init.headers);
    if (this.cookies.size)
      headers.set("cookie", [...this.cookies].map(([k, v]) => `${k}=${v}`).join("; "));
    const res = await fetch(`${this.base}${path}`, { ...init, headers, redirect: "manual" });
    this.remember(res);
    return res;
  }

  /** NextAuth's credentials flow over HTTP: CSRF token, then the callback. */
  static async signIn(
    email: string,
    password = DEMO_PASSWORD,
    base: string = BASE_URL,
  ): Promise<Session> {
    const s = new Session(base);
    const csrf = (await (await s.fetch("/api/auth/csrf")).json()) as { csrfToken: string };
    await s.fetch("/api/auth/callback/credentials", {
      method: "POST",
      headers: { "content-type": "application/x-www-form-urlencoded" },
      body: new URLSearchParams({
        csrfToken: csrf.csrfToken,
        email,
        password,
        json: "true",
      }).toString(),
    });
    return s;
  }

  /** A second client holding the same cookies now: a copied (stolen) session token. */
  copy(): Session {
    const other = new Session(this.base);
    for (const [k, v] of this.cookies) other.cookies.set(k, v);
    return other;
  }

  /** NextAuth's sign-out over HTTP (CSRF token, then the POST). */
  async signOut(): Promise<void> {
    const csrf = (await (await this.fetch("/api/auth/csrf")).json()) as { csrfToken: string };
    await this.fetch("/api/auth/signout", {
      method: "POST",
      headers: { "content-type": "application/x-www-form-urlencoded" },
      body: new URLSearchParams({ csrfToken: csrf.csrfToken, json: "true" }).toString(),
    });
  }

  json(path: string, method: string, body: unknown): Promise<Response> {
    return this.fetch(path, {
      method,
      headers: { "content-type": "application/json" },
      body: typeof body === "string" ? body : JSON.stringify(body),
    });
  }
}

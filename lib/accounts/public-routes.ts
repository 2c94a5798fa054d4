import { after, NextResponse } from "next/server";
import { clientAddress, parseTrustedProxies } from "../auth/client-address";
import { db } from "../db";
import { getEnv } from "../env";
import { DomainError } from "../errors";
import { handleRoute, readWriteBody } from "../http";
import { consumeQuota } from "../rate-limit";
import { parseInput } from "../validation";
import { countResetRequest, issueResetLink, resetAnswer } from "./reset";
import { resetRequestSchema, tokenPasswordSchema } from "./schema";
import { setPasswordWithToken } from "./service";

// The two account routes that take no session (app/api/auth/reset and
// app/api/auth/password): they sit beside NextAuth's catch-all, where a static
// segment wins. No cookie gives them authority, so the cross-site guard of
// /api/v1 has nothing to protect; they still take JSON only.

function requireJson(request: Request): void {
  const type = (request.headers.get("content-type") ?? "").split(";")[0]!.trim().toLowerCase();
  if (type !== "application/json") {
    throw new DomainError("Send the request body as JSON (Content-Type: application/json).", 415);
  }
}

function client(request: Request): string {
  return clientAddress(
    request.headers.get("x-forwarded-for"),
    parseTrustedProxies(getEnv().TRUSTED_PROXIES),
  );
}

/**
 * "Forgot password": counted, then answered at once with the same words for
 * every address; the link is issued after the response (`after`), so the
 * answer's timing does not depend on whether the account exists.
 */
export function resetRequestRoute(request: Request): Promise<Response> {
  return handleRoute(async () => {
    requireJson(request);
    const input = parseInput(resetRequestSchema, await readWriteBody(request));
    const ip = client(request);
    const now = new Date();
    await countResetRequest(db(), input, ip, now);
    after(() =>
      issueResetLink(db(), input, ip, now).then(
        () => undefined,
        (error: unknown) => console.error("[accounts] reset link not issued", error),
      ),
    );
    return NextResponse.json({ message: resetAnswer() }, { status: 202 });
  });
}

/** Sets a password from an e-mailed link (invitation or reset). */
export function tokenPasswordRoute(request: Request): Promise<Response> {
  return handleRoute(async () => {
    requireJson(request);
    // Each try costs a bcrypt hash: counted per client address like reset requests.
    await consumeQuota(db(), `link-ip:${client(request)}`.slice(0, 64), "link_client");
    const input = parseInput(tokenPasswordSchema, await readWriteBody(request));
    const result = await setPasswordWithToken(db(), input);
    return NextResponse.json(
      { email: result.email, message: "Your password is set. Sign in with it now." },
      { status: 200 },
    );
  });
}

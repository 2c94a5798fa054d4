import { NextResponse } from "next/server";
import { withAuth } from "next-auth/middleware";
import { getEnv } from "./lib/env";
import { allowedOrigins, refuseCrossSiteWrite } from "./lib/request-guard";

// Every page needs a session; sign-in, forgot-password, set-password (an
// e-mailed link), NextAuth's own routes and static files are exempt. The JSON API answers 401 itself through the guard, but its writes
// pass the cross-site check here first (lib/request-guard.ts). Roles are
// checked by the guard in each page, action and route, not here.
export default withAuth(
  function middleware(request) {
    const { pathname } = request.nextUrl;
    if (pathname.startsWith("/api/")) {
      const env = getEnv();
      const refusal = refuseCrossSiteWrite(
        {
          method: request.method,
          pathname,
          headers: request.headers,
          origin: request.nextUrl.origin,
        },
        allowedOrigins(env.NEXTAUTH_URL, env.ALLOWED_ORIGINS),
      );
      if (refusal) {
        return NextResponse.json(
          { error: { message: refusal.message } },
          { status: refusal.status },
        );
      }
    }
    return NextResponse.next();
  },
  {
    pages: { signIn: "/sign-in" },
    get secret() {
      return getEnv().NEXTAUTH_SECRET;
    },
    callbacks: {
      authorized: ({ token, req }) =>
        req.nextUrl.pathname.startsWith("/api/") || typeof token?.uid === "number",
    },
  },
);

// The three upload endpoints stay out of the middleware: Next.js hands a
// middleware-matched route at most 10 MB of body and would cut a 12 MB file
// short. The session upload checks the same rule itself; the other two take
// bearer tokens only.
export const config = {
  matcher: [
    "/api/v1/((?!imports$|imports/hl7$|imports/monitor$).*)",
    // The account pages an e-mailed link opens need no session; the link is the credential.
    "/((?!sign-in|forgot-password|set-password|api/|_next/static|_next/image|favicon.ico).*)",
  ],
};

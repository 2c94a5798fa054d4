import type { NextAuthOptions } from "next-auth";
import CredentialsProvider from "next-auth/providers/credentials";
import { db } from "../db";
import { getEnv } from "../env";
import { appendLedger } from "../ledger/service";
import { clientAddress, parseTrustedProxies } from "./client-address";
import { safeRedirect } from "./redirects";
import { isRole } from "./roles";
import { endSession, startSession } from "./sessions";
import { SIGN_IN_UNAVAILABLE, SignInError, verifySignIn } from "./sign-in";
import { transact } from "../transaction";

function forwardedFor(headers: Record<string, unknown> | undefined): string | undefined {
  const value = headers?.["x-forwarded-for"];
  return typeof value === "string" ? value : undefined;
}

export const authOptions: NextAuthOptions = {
  // Read on use, not at import, so `next build` needs no secrets.
  get secret() {
    return getEnv().NEXTAUTH_SECRET;
  },
  // A shift is twelve hours at most; the guard ends idle and ended sessions sooner.
  session: { strategy: "jwt", maxAge: 12 * 60 * 60 },
  // Secure cookies whenever the site is served over https.
  get useSecureCookies() {
    return getEnv().NEXTAUTH_URL.startsWith("https://");
  },
  pages: { signIn: "/sign-in", error: "/sign-in" },
  providers: [
    CredentialsProvider({
      name: "Tidemark account",
      credentials: {
        email: { label: "E-mail", type: "email" },
        password: { label: "Password", type: "password" },
      },
      async authorize(credentials, req) {
        try {
          const trusted = parseTrustedProxies(getEnv().TRUSTED_PROXIES);
          const user = await verifySignIn(
            db(),
            { email: credentials?.email, password: credentials?.password },
            clientAddress(forwardedFor(req.headers), trusted),
          );
          const sessionId = await startSession(db(), user.id);
          return {
            id: String(user.id),
            email: user.email,
            name: user.name,
            role: user.role,
            sessionId,
          };
        } catch (error) {
          if (error instanceof SignInError) throw new Error(error.message);
          // Never let an internal error (SQL, bound values) reach the browser.
          console.error("[auth] sign-in failed on our side", error);
          throw new Error(SIGN_IN_UNAVAILABLE);
        }
      },
    }),
  ],
  callbacks: {
    jwt({ token, user }) {
      if (user) {
        token.uid = Number(user.id);
        token.role = (user as { role?: unknown }).role as string;
        token.sid = (user as { sessionId?: unknown }).sessionId as string;
      }
      return token;
    },
    session({ session, token }) {
      if (session.user && typeof token.uid === "number" && isRole(token.role)) {
        session.user.id = token.uid;
        session.user.role = token.role;
        if (typeof token.sid === "string") session.user.sid = token.sid;
      }
      return session;
    },
    redirect({ url, baseUrl }) {
      return safeRedirect(url, baseUrl);
    },
  },
  events: {
    async signOut({ token }) {
      const sid = token?.sid;
      const uid = token?.uid;
      const role = token?.role;
      if (typeof sid !== "string" || typeof uid !== "number" || !isRole(role)) return;
      await endSession(db(), sid, "sign_out");
      await transact(db(), (trx) =>
        appendLedger(
          trx,
          { id: uid, role },
          {
            action: "user.sign_out",
            entityType: "user",
            entityId: uid,
          },
        ),
      );
    },
  },
};

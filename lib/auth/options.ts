import type { NextAuthOptions } from "next-auth";
import CredentialsProvider from "next-auth/providers/credentials";
import { db } from "../db";
import { getEnv } from "../env";
import { isRole } from "./roles";
import { SignInError, verifySignIn } from "./sign-in";

function clientIpFrom(headers: Record<string, unknown> | undefined): string {
  const forwarded = headers?.["x-forwarded-for"];
  const first = typeof forwarded === "string" ? forwarded.split(",")[0]?.trim() : undefined;
  return first || "local";
}

export const authOptions: NextAuthOptions = {
  // Read on use, not at import, so `next build` needs no secrets.
  get secret() {
    return getEnv().NEXTAUTH_SECRET;
  },
  // A shift is twelve hours; the guard re-reads the user on every request anyway.
  session: { strategy: "jwt", maxAge: 12 * 60 * 60 },
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
          const user = await verifySignIn(
            db(),
            { email: credentials?.email, password: credentials?.password },
            clientIpFrom(req.headers),
          );
          return { id: String(user.id), email: user.email, name: user.name, role: user.role };
        } catch (error) {
          if (error instanceof SignInError) throw new Error(error.message);
          throw error;
        }
      },
    }),
  ],
  callbacks: {
    jwt({ token, user }) {
      if (user) {
        token.uid = Number(user.id);
        token.role = (user as { role?: unknown }).role as string;
      }
      return token;
    },
    session({ session, token }) {
      if (session.user && typeof token.uid === "number" && isRole(token.role)) {
        session.user.id = token.uid;
        session.user.role = token.role;
      }
      return session;
    },
  },
};

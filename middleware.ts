import { withAuth } from "next-auth/middleware";
import { getEnv } from "./lib/env";

// Every page needs a session; sign-in, NextAuth's own routes, the JSON API
// (which answers 401 itself through the guard) and static files are exempt.
// Roles are checked by the guard in each page, action and route, not here.
export default withAuth({
  pages: { signIn: "/sign-in" },
  get secret() {
    return getEnv().NEXTAUTH_SECRET;
  },
  callbacks: { authorized: ({ token }) => typeof token?.uid === "number" },
});

export const config = {
  matcher: ["/((?!sign-in|api/|_next/static|_next/image|favicon.ico).*)"],
};

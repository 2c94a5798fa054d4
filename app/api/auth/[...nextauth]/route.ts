import NextAuth from "next-auth";
import { authOptions } from "@/lib/auth/options";

// next-auth v4 types its App Router handler loosely; this is its documented shape.
const handler = NextAuth(authOptions) as (request: Request, context: unknown) => Promise<Response>;

export { handler as GET, handler as POST };

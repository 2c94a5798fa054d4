import type { DefaultSession } from "next-auth";
import type { Role } from "@/lib/auth/roles";

declare module "next-auth" {
  interface Session {
    user?: DefaultSession["user"] & { id?: number; role?: Role; sid?: string };
  }
}

declare module "next-auth/jwt" {
  interface JWT {
    uid?: number;
    role?: string;
    /** The row in user_sessions that keeps this session valid. */
    sid?: string;
  }
}

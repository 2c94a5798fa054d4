import { getServerSession } from "next-auth";
import { db } from "../db";
import { UnauthenticatedError } from "../errors";
import type { Actor } from "./actor";
import { assertRole, loadActor } from "./actor-queries";
import { authOptions } from "./options";
import type { Role } from "./roles";
import { rolesFor, type Permission } from "./permissions";
import { checkSession } from "./sessions";

/**
 * The one server-side guard. Every server action, route handler and protected
 * page calls it first: no session, no query.
 */
export async function requireRole(...roles: Role[]): Promise<Actor> {
  const session = await getServerSession(authOptions);
  const userId = session?.user?.id;
  const sessionId = session?.user?.sid;
  if (typeof userId !== "number" || typeof sessionId !== "string") throw new UnauthenticatedError();
  await checkSession(db(), sessionId, userId);
  const actor = await loadActor(db(), userId);
  if (roles.length > 0) assertRole(actor, roles);
  return actor;
}

/** Any signed-in, active user. */
export function requireActor(): Promise<Actor> {
  return requireRole();
}

/** The guard for one action of the permission table (lib/auth/permissions.ts). */
export function requirePermission(permission: Permission): Promise<Actor> {
  return requireRole(...rolesFor(permission));
}

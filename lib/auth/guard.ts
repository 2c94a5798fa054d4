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
export function requireRole(...roles: Role[]): Promise<Actor> {
  return guard(roles, {});
}

/** The session's actor and its session id (the row in user_sessions). */
export async function requireSession(
  roles: readonly Role[],
  opts: { allowPasswordChange?: boolean },
): Promise<{ actor: Actor; sessionId: string }> {
  const session = await getServerSession(authOptions);
  const userId = session?.user?.id;
  const sessionId = session?.user?.sid;
  if (typeof userId !== "number" || typeof sessionId !== "string") throw new UnauthenticatedError();
  await checkSession(db(), sessionId, userId);
  const actor = await loadActor(db(), userId, opts);
  if (roles.length > 0) assertRole(actor, roles);
  return { actor, sessionId };
}

async function guard(
  roles: readonly Role[],
  opts: { allowPasswordChange?: boolean },
): Promise<Actor> {
  return (await requireSession(roles, opts)).actor;
}

/** Any signed-in, active user. */
export function requireActor(): Promise<Actor> {
  return requireRole();
}

/** The guard for one action of the permission table (lib/auth/permissions.ts). */
export function requirePermission(permission: Permission): Promise<Actor> {
  // Changing one's own password is the one thing open while an
  // administrator-set password still has to be changed.
  if (permission !== "account.password") return guard(rolesFor(permission), {});
  return requireSession(rolesFor(permission), { allowPasswordChange: true }).then(
    ({ actor, sessionId }) => ({ ...actor, sessionId }),
  );
}

import { forbidden, redirect } from "next/navigation";
import { ForbiddenError, PasswordChangeRequiredError, UnauthenticatedError } from "../errors";
import type { Actor } from "./actor";
import { db } from "../db";
import { requireRole, requireSession } from "./guard";
import type { Role } from "./roles";
import { rolesFor, type Permission } from "./permissions";
import { SessionEndedError } from "./sessions";

/**
 * The guard for pages: the same requireRole, with its failures turned into the
 * sign-in redirect (401) or the framework's 403 page.
 */
export async function pageActor(...roles: Role[]): Promise<Actor> {
  try {
    return await requireRole(...roles);
  } catch (error) {
    if (error instanceof SessionEndedError) redirect(`/sign-in?ended=${error.reason}`);
    if (error instanceof UnauthenticatedError) redirect("/sign-in");
    if (error instanceof PasswordChangeRequiredError) redirect("/change-password");
    if (error instanceof ForbiddenError) forbidden();
    throw error;
  }
}

/** pageActor for one action of the permission table. */
export function pagePermission(permission: Permission): Promise<Actor> {
  return pageActor(...rolesFor(permission));
}

/**
 * The change-password page: any signed-in user, including one whose
 * administrator-set password must be changed first (`required`).
 */
export async function pagePasswordChange(): Promise<{ actor: Actor; required: boolean }> {
  try {
    const { actor } = await requireSession([], { allowPasswordChange: true });
    const row = (await db()("users").where({ id: actor.id }).first("password_change_required")) as
      { password_change_required: number } | undefined;
    return { actor, required: Boolean(row?.password_change_required) };
  } catch (error) {
    if (error instanceof SessionEndedError) redirect(`/sign-in?ended=${error.reason}`);
    if (error instanceof UnauthenticatedError) redirect("/sign-in");
    throw error;
  }
}

import type { Knex } from "knex";
import {
  ForbiddenError,
  NotFoundError,
  PasswordChangeRequiredError,
  UnauthenticatedError,
} from "../errors";
import type { Actor } from "./actor";
import { isRole, type Role } from "./roles";

/**
 * Loads the acting user fresh from the database on every request, so a
 * deactivation or a role change takes effect at once, not at token expiry.
 * A user whose password an administrator set is refused everything but the
 * change of that password (`allowPasswordChange`) until they have changed it.
 */
export async function loadActor(
  knex: Knex,
  userId: number,
  opts: { allowPasswordChange?: boolean } = {},
): Promise<Actor> {
  const user = (await knex("users")
    .where({ id: userId })
    .first(
      "id",
      "email",
      "name",
      "role",
      "active",
      "pressure_unit",
      "password_change_required",
    )) as
    | {
        id: number;
        email: string;
        name: string;
        role: string;
        active: number;
        pressure_unit: "mmHg" | "kPa";
        password_change_required: number;
      }
    | undefined;
  if (!user || !user.active || !isRole(user.role)) throw new UnauthenticatedError();
  if (user.password_change_required && !opts.allowPasswordChange) {
    throw new PasswordChangeRequiredError();
  }
  const units = (await knex("user_units")
    .join("units", "units.id", "user_units.unit_id")
    .where({ user_id: userId, "units.active": true })
    .orderBy("units.id")
    .select("units.id")) as { id: number }[];
  return {
    id: user.id,
    email: user.email,
    name: user.name,
    role: user.role,
    unitIds: units.map((u) => u.id),
    pressureUnit: user.pressure_unit,
  };
}

export function assertRole(actor: Actor, roles: readonly Role[]): void {
  if (!roles.includes(actor.role)) throw new ForbiddenError();
}

/** Another unit's records answer as if they did not exist (no existence leak). */
export function assertUnitAccess(actor: Actor, unitId: number): void {
  if (!actor.unitIds.includes(unitId)) throw new NotFoundError();
}

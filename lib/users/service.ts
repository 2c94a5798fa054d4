import type { Knex } from "knex";
import type { Actor } from "../auth/actor";
import { confirmAdminPassword } from "../auth/reauth";
import { hashPassword } from "../auth/password";
import { endUserSessions } from "../auth/sessions";
import { duplicateIndex } from "../db-errors";
import { ConflictError, NotFoundError, ValidationError } from "../errors";
import { appendLedger } from "../ledger/service";
import { getUser, type UserSummary } from "./queries";
import { type UserActiveData, type UserCreateData, type UserUpdateData } from "./schema";
import { transact } from "../transaction";
import { inviteInTransaction } from "../accounts/service";
import { newAccountToken } from "../accounts/tokens";

/** What the ledger records of a user: never the password hash. */
function ledgerView(u: UserSummary) {
  return {
    email: u.email,
    name: u.name,
    role: u.role,
    active: u.active,
    pressureUnit: u.pressureUnit,
    unitIds: u.units.map((x) => x.id),
  };
}

async function assertUnitsExist(trx: Knex.Transaction, unitIds: number[]): Promise<void> {
  const found = (await trx("units")
    .whereIn("id", unitIds)
    .where({ active: true })
    .select("id")) as {
    id: number;
  }[];
  if (found.length !== new Set(unitIds).size) {
    throw new ValidationError("Some fields need attention.", {
      unitIds: ["One or more units do not exist or are inactive."],
    });
  }
}

function rethrowDuplicate(error: unknown): never {
  if (duplicateIndex(error) === "users_email_unique") {
    throw new ConflictError("Another account already uses this e-mail.", {
      email: ["Another account already uses this e-mail."],
    });
  }
  throw error;
}

/** Creates a user with their units, and its ledger row, in one transaction. */
export async function createUser(
  knex: Knex,
  actor: Actor,
  input: UserCreateData,
  now: Date = new Date(),
): Promise<UserSummary> {
  await confirmAdminPassword(knex, actor.id, input.currentPassword);
  // Invited: no password until the user chooses one. Otherwise the
  // administrator's password opens only the change-password page.
  const passwordHash = input.invite ? null : await hashPassword(input.password);
  const token = input.invite ? newAccountToken() : null;
  try {
    return await transact(knex, async (trx) => {
      await assertUnitsExist(trx, input.unitIds);
      const [id] = await trx("users").insert({
        email: input.email,
        name: input.name,
        role: input.role,
        password_hash: passwordHash,
        password_change_required: !input.invite,
        pressure_unit: input.pressureUnit,
      });
      const userId = Number(id);
      await trx("user_units").insert(
        [...new Set(input.unitIds)].map((unitId) => ({ user_id: userId, unit_id: unitId })),
      );
      const created = (await getUser(trx, userId))!;
      await appendLedger(trx, actor, {
        action: "user.create",
        entityType: "user",
        entityId: userId,
        after: { ...ledgerView(created), signIn: input.invite ? "invited" : "set_by_admin" },
        rationale: input.rationale || null,
      });
      if (token) await inviteInTransaction(trx, actor, created, token, now);
      return token ? (await getUser(trx, userId))! : created;
    });
  } catch (error) {
    rethrowDuplicate(error);
  }
}

async function lockForChange(
  trx: Knex.Transaction,
  id: number,
  version: number,
): Promise<UserSummary> {
  const locked = (await trx("users").where({ id }).forUpdate().first("id", "version")) as
    { id: number; version: number } | undefined;
  if (!locked) throw new NotFoundError("That user does not exist.");
  const current = (await getUser(trx, id))!;
  if (locked.version !== version) {
    throw new ConflictError(
      `${current.name}'s account was changed by someone else while you were editing. Reload to see the current details, then apply your change again.`,
    );
  }
  return current;
}

/** Edits a user's details, role and units; refuses a stale version. */
export async function updateUser(
  knex: Knex,
  actor: Actor,
  input: UserUpdateData,
): Promise<UserSummary> {
  await confirmAdminPassword(knex, actor.id, input.currentPassword);
  if (input.id === actor.id && input.role !== "admin") {
    throw new ValidationError("You cannot remove your own administrator role.", {
      role: ["You cannot remove your own administrator role; ask another administrator."],
    });
  }
  const passwordHash = input.password ? await hashPassword(input.password) : undefined;
  try {
    return await transact(knex, async (trx) => {
      const before = await lockForChange(trx, input.id, input.version);
      await assertUnitsExist(trx, input.unitIds);
      await trx("users")
        .where({ id: input.id })
        .update({
          email: input.email,
          name: input.name,
          role: input.role,
          pressure_unit: input.pressureUnit,
          // A password set for someone else is theirs to change at next sign-in.
          ...(passwordHash
            ? { password_hash: passwordHash, password_change_required: input.id !== actor.id }
            : {}),
          version: before.version + 1,
          updated_at: trx.fn.now(3),
        });
      await trx("user_units").where({ user_id: input.id }).delete();
      await trx("user_units").insert(
        [...new Set(input.unitIds)].map((unitId) => ({ user_id: input.id, unit_id: unitId })),
      );
      const after = (await getUser(trx, input.id))!;
      // A new password, role or set of units ends the user's open sessions at once.
      const sameUnits =
        JSON.stringify(ledgerView(before).unitIds.toSorted()) ===
        JSON.stringify(ledgerView(after).unitIds.toSorted());
      const endedSessions = passwordHash
        ? await endUserSessions(trx, input.id, "password_changed")
        : before.role !== after.role || !sameUnits
          ? await endUserSessions(trx, input.id, "role_or_units_changed")
          : 0;
      await appendLedger(trx, actor, {
        action: "user.update",
        entityType: "user",
        entityId: input.id,
        before: ledgerView(before),
        after: {
          ...ledgerView(after),
          ...(passwordHash ? { passwordChanged: true } : {}),
          ...(endedSessions ? { sessionsEnded: endedSessions } : {}),
        },
        rationale: input.rationale || null,
      });
      return after;
    });
  } catch (error) {
    rethrowDuplicate(error);
  }
}

/** Deactivates (or reactivates) an account; a reason is required. */
export async function setUserActive(
  knex: Knex,
  actor: Actor,
  input: UserActiveData,
): Promise<UserSummary> {
  await confirmAdminPassword(knex, actor.id, input.currentPassword);
  if (input.id === actor.id && !input.active) {
    throw new ValidationError("You cannot deactivate your own account.", {
      active: ["You cannot deactivate your own account; ask another administrator."],
    });
  }
  return transact(knex, async (trx) => {
    const before = await lockForChange(trx, input.id, input.version);
    await trx("users")
      .where({ id: input.id })
      .update({ active: input.active, version: before.version + 1, updated_at: trx.fn.now(3) });
    if (!input.active) await endUserSessions(trx, input.id, "deactivated");
    const after = (await getUser(trx, input.id))!;
    await appendLedger(trx, actor, {
      action: input.active ? "user.reactivate" : "user.deactivate",
      entityType: "user",
      entityId: input.id,
      before: ledgerView(before),
      after: ledgerView(after),
      rationale: input.rationale,
    });
    return after;
  });
}

import { newUser } from "./access-fixtures";
import type { ActionEntry, RouteEntry } from "./access-matrix";
import { DEMO_PASSWORD } from "./browser";
import { appDb } from "./db";

// Account e-mails: an administrator invites a user who has no password of
// their own; everyone changes their own password. Neither is about one unit's
// records: one cell per role. The change sets the same password again (allowed
// unless an administrator set it), so the matrix's accounts keep signing in.

/** A user who has not set a password yet: the one an invitation is for. */
async function invitee(): Promise<number> {
  const user = await newUser("nurse", "matrix-invite");
  await appDb()("users").where({ id: user.id }).update({ password_hash: null });
  return user.id;
}

const samePassword = {
  currentPassword: DEMO_PASSWORD,
  password: DEMO_PASSWORD,
  confirmPassword: DEMO_PASSWORD,
};

export const ACCOUNT_ROUTES: Omit<RouteEntry, "via">[] = [
  {
    name: "POST /api/v1/users/[userId]/invite",
    permission: "user.manage",
    scope: "none",
    ok: 201,
    call: async () => ({
      path: `/api/v1/users/${await invitee()}/invite`,
      method: "POST",
      json: { currentPassword: DEMO_PASSWORD },
    }),
  },
  {
    name: "POST /api/v1/me/password",
    permission: "account.password",
    scope: "none",
    ok: 200,
    call: () => ({ path: "/api/v1/me/password", method: "POST", json: samePassword }),
  },
];

export const ACCOUNT_ACTIONS: Omit<ActionEntry, "via">[] = [
  {
    name: "inviteUserAction",
    permission: "user.manage",
    scope: "none",
    ok: 200,
    arg: async () => ({ id: await invitee(), currentPassword: DEMO_PASSWORD }),
  },
  {
    name: "changePasswordAction",
    permission: "account.password",
    scope: "none",
    ok: 200,
    arg: () => samePassword,
  },
];

import { defineWrite } from "../boundary/operation";
import { changePasswordSchema, inviteSchema } from "./schema";
import { changeOwnPassword, inviteUser } from "./service";

/** An administrator sends an invitation link (a new one voids the old). */
export const inviteUserOperation = defineWrite({
  permission: "user.manage",
  schema: inviteSchema,
  run: (knex, actor, input, now) => inviteUser(knex, actor, input, now),
});

/** One's own password; open even while an administrator-set password awaits its change. */
export const changePasswordOperation = defineWrite({
  permission: "account.password",
  schema: changePasswordSchema,
  run: (knex, actor, input, now) => changeOwnPassword(knex, actor, input, now),
});

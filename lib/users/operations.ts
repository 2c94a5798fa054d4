import { z } from "zod";
import { defineRead, defineWrite } from "../boundary/operation";
import { NotFoundError } from "../errors";
import { getUser, listUsers } from "./queries";
import { userActiveSchema, userCreateSchema, userUpdateSchema } from "./schema";
import { createUser, setUserActive, updateUser } from "./service";

export const createUserOperation = defineWrite({
  permission: "user.manage",
  schema: userCreateSchema,
  run: (knex, actor, input, now) => createUser(knex, actor, input, now),
});

/** Full update; the input names the version it was based on (409 if stale). */
export const updateUserOperation = defineWrite({
  permission: "user.manage",
  schema: userUpdateSchema,
  run: (knex, actor, input) => updateUser(knex, actor, input),
});

export const setUserActiveOperation = defineWrite({
  permission: "user.manage",
  schema: userActiveSchema,
  run: (knex, actor, input) => setUserActive(knex, actor, input),
});

export const listUsersOperation = defineRead({
  permission: "user.manage",
  schema: z.object({}),
  run: (knex) => listUsers(knex),
});

export const readUserOperation = defineRead({
  permission: "user.manage",
  schema: z.object({ id: z.number().int().positive() }),
  run: async (knex, _actor, { id }) => {
    const user = await getUser(knex, id);
    if (!user) throw new NotFoundError("That user does not exist.");
    return user;
  },
});

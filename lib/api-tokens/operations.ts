import { defineWrite } from "../boundary/operation";
import { apiTokenCreateSchema, apiTokenRevokeSchema } from "./schema";
import { createApiToken, revokeApiToken } from "./service";

/** The token itself is answered once, by this operation, and never again: only its hash is stored. */
export const createApiTokenOperation = defineWrite({
  permission: "api_token.manage",
  schema: apiTokenCreateSchema,
  run: (knex, actor, input, now) => createApiToken(knex, actor, input, now),
});

export const revokeApiTokenOperation = defineWrite({
  permission: "api_token.manage",
  schema: apiTokenRevokeSchema,
  run: (knex, actor, input, now) => revokeApiToken(knex, actor, input, now),
});

import { z } from "zod";
import { currentPassword } from "../users/schema";

// One schema per write, shared by the admin form and the server.

export const API_TOKEN_SCOPES = ["read", "write"] as const;
export type ApiTokenScope = (typeof API_TOKEN_SCOPES)[number];

/** A token lives a year unless the admin chooses otherwise, and never longer than two. */
export const TOKEN_DAYS_DEFAULT = 365;
export const TOKEN_DAYS_MAX = 730;
const validDaysMessage = `Valid for must be a whole number of days between 1 and ${TOKEN_DAYS_MAX}.`;

export const apiTokenCreateSchema = z.object({
  name: z
    .string()
    .trim()
    .min(3, "Name must be 3 to 120 characters.")
    .max(120, "Name must be 3 to 120 characters."),
  scope: z.enum(API_TOKEN_SCOPES, { error: "Scope must be read or write." }),
  unitIds: z
    .array(z.number().int().positive())
    .min(1, "Choose at least one unit.")
    .max(50, "At most 50 units."),
  validDays: z
    .number({ error: validDaysMessage })
    .int(validDaysMessage)
    .min(1, validDaysMessage)
    .max(TOKEN_DAYS_MAX, validDaysMessage)
    .default(TOKEN_DAYS_DEFAULT),
  currentPassword,
});
export type ApiTokenCreateInput = z.input<typeof apiTokenCreateSchema>;

export const apiTokenRevokeSchema = z.object({
  id: z.number().int().positive(),
  rationale: z
    .string()
    .trim()
    .min(3, "Give a reason of 3 to 500 characters; it is recorded in the ledger.")
    .max(500, "Give a reason of 3 to 500 characters; it is recorded in the ledger."),
  currentPassword,
});
export type ApiTokenRevokeInput = z.input<typeof apiTokenRevokeSchema>;

/** Parsed input, as the services receive it from the boundary (lib/boundary). */
export type ApiTokenCreateData = z.output<typeof apiTokenCreateSchema>;
export type ApiTokenRevokeData = z.output<typeof apiTokenRevokeSchema>;

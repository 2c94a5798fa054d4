import { z } from "zod";
import { ROLES } from "../auth/roles";

// One schema per write, shared by the admin form (zodResolver) and the server.

const email = z
  .string()
  .trim()
  .toLowerCase()
  .max(254, "E-mail must be at most 254 characters.")
  .pipe(z.email("Enter a valid e-mail address."));

const name = z
  .string()
  .trim()
  .min(2, "Name must be 2 to 120 characters.")
  .max(120, "Name must be 2 to 120 characters.");

const role = z.enum(ROLES, { error: `Role must be one of: ${ROLES.join(", ")}.` });

const unitIds = z
  .array(z.number().int().positive())
  .min(1, "Assign at least one unit.")
  .max(50, "At most 50 units.");

export const PASSWORD_MIN = 12;
export const newPassword = z
  .string()
  .min(PASSWORD_MIN, `Password must be ${PASSWORD_MIN} to 200 characters.`)
  .max(200, `Password must be ${PASSWORD_MIN} to 200 characters.`);

const pressureUnit = z.enum(["mmHg", "kPa"], { error: "Pressure unit must be mmHg or kPa." });

/** The administrator's own password, re-entered for every change to an account. */
export const currentPassword = z
  .string({ error: "Enter your own password to confirm the change." })
  .min(1, "Enter your own password to confirm the change.")
  .max(200, "Enter your own password to confirm the change.");

const rationale = z
  .string()
  .trim()
  .max(500, "Rationale must be at most 500 characters.")
  .optional()
  .default("");

/** Fields shared by create and edit; the edit form leaves the password empty to keep it. */
export const userFieldsSchema = z.object({
  email,
  name,
  role,
  unitIds,
  pressureUnit,
  rationale,
  password: z.union([z.literal(""), newPassword]),
  currentPassword,
});

/**
 * A new user gets either a password from the administrator (to be changed at
 * first sign-in) or an e-mailed invitation to choose one (`invite`).
 */
export const userCreateSchema = userFieldsSchema
  .extend({
    invite: z.boolean({ error: "Invite must be true or false." }).optional().default(false),
  })
  .superRefine((v, ctx) => {
    if (!v.invite && v.password === "") {
      ctx.addIssue({
        code: "custom",
        path: ["password"],
        message: `Set a password of ${PASSWORD_MIN} to 200 characters, or send an invitation instead.`,
      });
    }
  });
export type UserCreateInput = z.input<typeof userCreateSchema>;

export const userUpdateSchema = userFieldsSchema.extend({
  id: z.number().int().positive(),
  version: z.number().int().positive(),
});
export type UserUpdateInput = z.input<typeof userUpdateSchema>;

/** What the admin form holds (create and edit alike; `invite` only on create). */
export type UserFormValues = z.input<typeof userFieldsSchema> & { invite?: boolean };

export const userActiveSchema = z.object({
  id: z.number().int().positive(),
  version: z.number().int().positive(),
  active: z.boolean(),
  currentPassword,
  rationale: z
    .string()
    .trim()
    .min(3, "Give a reason (3 to 500 characters).")
    .max(500, "Give a reason (3 to 500 characters)."),
});
export type UserActiveInput = z.input<typeof userActiveSchema>;

export const USER_SORT_KEYS = ["name", "email", "role", "active", "updatedAt"] as const;
export type UserSortKey = (typeof USER_SORT_KEYS)[number];

/** Parsed input, as the services receive it from the boundary (lib/boundary). */
export type UserCreateData = z.output<typeof userCreateSchema>;
export type UserUpdateData = z.output<typeof userUpdateSchema>;
export type UserActiveData = z.output<typeof userActiveSchema>;

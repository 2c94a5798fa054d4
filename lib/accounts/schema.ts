import { z } from "zod";
import { currentPassword, newPassword } from "../users/schema";

// One schema per write, shared by the forms and the server.

/** An administrator sends (or sends again) an invitation; the old link stops working. */
export const inviteSchema = z.object({
  id: z.number().int().positive(),
  currentPassword,
});
export type InviteInput = z.input<typeof inviteSchema>;
export type InviteData = z.output<typeof inviteSchema>;

/** "Forgot password": the address typed on the sign-in page. */
export const resetRequestSchema = z.object({
  email: z
    .string({ error: "Enter your e-mail address." })
    .trim()
    .toLowerCase()
    .min(1, "Enter your e-mail address.")
    .max(254, "E-mail must be at most 254 characters.")
    .pipe(z.email("Enter a valid e-mail address.")),
});
export type ResetRequestInput = z.input<typeof resetRequestSchema>;
export type ResetRequestData = z.output<typeof resetRequestSchema>;

const repeated = <
  T extends z.ZodObject<{ password: typeof newPassword; confirmPassword: z.ZodString }>,
>(
  schema: T,
) =>
  schema.refine((v) => v.password === v.confirmPassword, {
    path: ["confirmPassword"],
    message: "The two passwords differ: type the same new password twice.",
  });

const confirmPassword = z
  .string({ error: "Type the new password again." })
  .max(200, "Type the new password again (at most 200 characters).");

/** The page an e-mailed link opens: the link's secret and the new password, twice. */
export const tokenPasswordSchema = repeated(
  z.object({
    token: z
      .string({ error: "The link is incomplete: open it from the e-mail again." })
      .min(20, "The link is incomplete: open it from the e-mail again.")
      .max(200, "The link is incomplete: open it from the e-mail again."),
    password: newPassword,
    confirmPassword,
  }),
);
export type TokenPasswordInput = z.input<typeof tokenPasswordSchema>;
export type TokenPasswordData = z.output<typeof tokenPasswordSchema>;

/** Changing one's own password, signed in: the current one, then the new one twice. */
export const changePasswordSchema = repeated(
  z.object({
    currentPassword: z
      .string({ error: "Enter the password you signed in with." })
      .min(1, "Enter the password you signed in with.")
      .max(200, "Enter the password you signed in with."),
    password: newPassword,
    confirmPassword,
  }),
);
export type ChangePasswordInput = z.input<typeof changePasswordSchema>;
export type ChangePasswordData = z.output<typeof changePasswordSchema>;

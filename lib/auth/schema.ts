import { z } from "zod";

/** Sign-in form, shared by the page and the credentials check. */
export const signInSchema = z.object({
  email: z
    .string()
    .trim()
    .min(1, "Enter your e-mail address.")
    .max(254, "E-mail must be at most 254 characters.")
    .pipe(z.email("Enter a valid e-mail address.")),
  password: z
    .string()
    .min(1, "Enter your password.")
    .max(200, "Password must be at most 200 characters."),
});
export type SignInInput = z.infer<typeof signInSchema>;

import type { Knex } from "knex";
import { ValidationError } from "../errors";
import { verifyPassword } from "./password";

/** Signing re-asks the password: a signature is the signer's own act, not a left-open session's. */
export async function confirmPassword(knex: Knex, userId: number, password: string): Promise<void> {
  const row = (await knex("users").where({ id: userId }).first("password_hash")) as
    { password_hash: string } | undefined;
  if (!row || !(await verifyPassword(password, row.password_hash))) {
    throw new ValidationError("The password does not match; nothing was signed.", {
      password: ["The password does not match your account."],
    });
  }
}

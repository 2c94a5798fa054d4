import type { FieldErrors, UseFormRegister } from "react-hook-form";
import { Field, inputClasses } from "@/components/ui/Field";
import { PASSWORD_MIN } from "@/lib/users/schema";

type Values = { password: string; confirmPassword: string };

/** The new password, typed twice, with the rule in words. */
export function NewPasswordFields<T extends Values>({
  register,
  errors,
}: {
  register: UseFormRegister<T>;
  errors: FieldErrors<T>;
}) {
  const reg = register as unknown as UseFormRegister<Values>;
  const errs = errors as FieldErrors<Values>;
  return (
    <>
      <Field
        id="password"
        label="New password"
        hint={`${PASSWORD_MIN} to 200 characters. A short sentence is easier to remember.`}
        error={errs.password?.message}
      >
        {(d, invalid) => (
          <input
            id="password"
            type="password"
            autoComplete="new-password"
            className={inputClasses}
            aria-invalid={invalid}
            aria-describedby={d}
            {...reg("password")}
          />
        )}
      </Field>
      <Field id="confirmPassword" label="New password, again" error={errs.confirmPassword?.message}>
        {(d, invalid) => (
          <input
            id="confirmPassword"
            type="password"
            autoComplete="new-password"
            className={inputClasses}
            aria-invalid={invalid}
            aria-describedby={d}
            {...reg("confirmPassword")}
          />
        )}
      </Field>
    </>
  );
}

import type { ComponentPropsWithRef } from "react";
import { Field, inputClasses } from "./Field";

/**
 * "Your password": the acting user's own password, re-entered to confirm a
 * change to accounts or API tokens. `input` takes react-hook-form's
 * `register(...)` or a controlled value and onChange alike.
 */
export function OwnPasswordField({
  id,
  hint,
  error,
  className = "",
  input,
}: {
  id: string;
  hint: string;
  error: string | undefined;
  className?: string;
  input: ComponentPropsWithRef<"input">;
}) {
  return (
    <Field id={id} label="Your password" hint={hint} error={error}>
      {(d, invalid) => (
        <input
          id={id}
          type="password"
          autoComplete="current-password"
          className={`${inputClasses} ${className}`}
          aria-invalid={invalid}
          aria-describedby={d}
          {...input}
        />
      )}
    </Field>
  );
}

import type { FieldValues, Path, RegisterOptions, UseFormReturn } from "react-hook-form";
import { Field, inputClasses } from "./Field";

export type SelectOption = string | { value: string; label: string };

/**
 * A labelled select of a form (see Field), with the id `${id}-${name}` and its
 * error from the form. Plain strings are both value and label; `emptyLabel`
 * adds a first option with no value ("Not stated", "Choose…").
 */
export function SelectField<T extends FieldValues>({
  form,
  id,
  name,
  label,
  hint,
  options,
  emptyLabel,
  defaultValue,
  registerOptions,
}: {
  form: Pick<UseFormReturn<T>, "register" | "getFieldState" | "formState">;
  /** The form's useId prefix. */
  id: string;
  name: Path<T>;
  label: string;
  hint?: string;
  options: readonly SelectOption[];
  emptyLabel?: string;
  defaultValue?: string;
  registerOptions?: RegisterOptions<T, Path<T>>;
}) {
  const fieldId = `${id}-${name}`;
  const error = form.getFieldState(name, form.formState).error?.message;
  return (
    <Field id={fieldId} label={label} hint={hint} error={error}>
      {(d, invalid) => (
        <select
          id={fieldId}
          className={inputClasses}
          aria-invalid={invalid}
          aria-describedby={d}
          defaultValue={defaultValue}
          {...form.register(name, registerOptions)}
        >
          {emptyLabel !== undefined ? <option value="">{emptyLabel}</option> : null}
          {options.map((o) => {
            const { value, label: text } = typeof o === "string" ? { value: o, label: o } : o;
            return (
              <option key={value} value={value}>
                {text}
              </option>
            );
          })}
        </select>
      )}
    </Field>
  );
}

"use client";

import { useRouter } from "next/navigation";
import { useState } from "react";
import type {
  FieldValues,
  Path,
  PathValue,
  UseFormRegisterReturn,
  UseFormReturn,
} from "react-hook-form";
import { Button } from "@/components/ui/Button";
import { Field, inputClasses } from "@/components/ui/Field";
import type { ActionResult } from "@/lib/action-result";

// What co-signing and discontinuing an order share: a password asked again,
// a refusal shown beside its field (the password cleared, what else was typed
// kept), a conflict linking to the fresh order, and a done message.

type StepState = { formError: string | null; conflict: boolean; done: boolean };

export function useSignedOrderStep<T extends FieldValues & { password: string }>(
  form: Pick<UseFormReturn<T>, "setError" | "setValue">,
  fields: readonly Path<T>[],
  unreachable: string,
) {
  const router = useRouter();
  const [state, setState] = useState<StepState>({ formError: null, conflict: false, done: false });
  const clearPassword = () => form.setValue("password" as Path<T>, "" as PathValue<T, Path<T>>);

  async function run(call: () => Promise<ActionResult<unknown>>): Promise<void> {
    setState({ formError: null, conflict: false, done: false });
    let result: ActionResult<unknown>;
    try {
      result = await call();
    } catch {
      setState({ formError: unreachable, conflict: false, done: false });
      return;
    }
    if (result.ok) {
      setState({ formError: null, conflict: false, done: true });
      clearPassword();
      router.refresh();
      return;
    }
    let focused = false;
    for (const [path, messages] of Object.entries(result.fieldErrors ?? {})) {
      const field = fields.find((f) => f === path);
      if (!field) continue;
      if (field === "password") clearPassword();
      form.setError(
        field,
        { type: "server", message: messages.join(" ") },
        { shouldFocus: !focused },
      );
      focused = true;
    }
    setState({ formError: result.message, conflict: result.status === 409, done: false });
  }

  return { state, run };
}

/** The password asked again to sign; `alsoDescribedBy` links the signature's meaning. */
export function SignPasswordField({
  id,
  label,
  hint,
  error,
  registration,
  alsoDescribedBy,
}: {
  id: string;
  label: string;
  hint?: string;
  error?: string;
  registration: UseFormRegisterReturn;
  alsoDescribedBy?: string;
}) {
  return (
    <div className="max-w-sm">
      <Field id={id} label={label} hint={hint} error={error}>
        {(d, invalid) => (
          <input
            id={id}
            type="password"
            autoComplete="current-password"
            className={inputClasses}
            aria-invalid={invalid}
            aria-describedby={[d, alsoDescribedBy].filter(Boolean).join(" ") || undefined}
            {...registration}
          />
        )}
      </Field>
    </div>
  );
}

/** Submit, and the outcome in words: refusal, a link to reload after a conflict, or done. */
export function SignedStepFooter({
  orderId,
  state,
  submitting,
  label,
  busyLabel,
  doneText,
  variant = "primary",
}: {
  orderId: number;
  state: StepState;
  submitting: boolean;
  label: string;
  busyLabel: string;
  doneText: string;
  variant?: "primary" | "danger";
}) {
  return (
    <div className="flex flex-wrap items-center gap-3">
      <Button type="submit" variant={variant} disabled={submitting || state.done}>
        {submitting ? busyLabel : label}
      </Button>
      <p role="status" aria-live="polite" className="text-sm">
        {state.formError ? <span className="font-medium text-below">{state.formError}</span> : null}
        {state.conflict ? (
          <a href={`/orders/${orderId}`} className="ml-2 text-accent underline underline-offset-2">
            Reload the order
          </a>
        ) : null}
        {state.done ? <span className="text-in-band">{doneText}</span> : null}
      </p>
    </div>
  );
}

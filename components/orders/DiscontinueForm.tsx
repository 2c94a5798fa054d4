"use client";

import { zodResolver } from "@hookform/resolvers/zod";
import { useForm } from "react-hook-form";
import { discontinueOrderAction } from "@/lib/orders/actions";
import { Field, inputClasses } from "@/components/ui/Field";
import { discontinueSchema } from "@/lib/orders/schema";
import { SignedStepFooter, SignPasswordField, useSignedOrderStep } from "./SignedOrderStep";

const formSchema = discontinueSchema.pick({ reason: true, password: true });
type DiscontinueValues = { reason: string; password: string };
const FIELDS = ["reason", "password"] as const;

/**
 * A physician stops the order in effect: a reason and the password. Tucked in a
 * disclosure so it is never pressed by accident; the reason stays if refused.
 */
export function DiscontinueForm({ orderId, version }: { orderId: number; version: number }) {
  const form = useForm<DiscontinueValues>({
    resolver: zodResolver(formSchema),
    defaultValues: { reason: "", password: "" },
  });
  const { state, run } = useSignedOrderStep(
    form,
    FIELDS,
    "Tidemark could not be reached. Nothing was changed; try again.",
  );
  const onSubmit = form.handleSubmit((values) =>
    run(() => discontinueOrderAction({ orderId, version, ...values })),
  );
  const errors = form.formState.errors;

  return (
    <details className="rounded-card border border-border bg-surface p-4 shadow-card">
      <summary className="cursor-pointer text-base font-semibold">Discontinue this order…</summary>
      <form
        onSubmit={onSubmit}
        noValidate
        aria-label="Discontinue order"
        className="mt-3 space-y-3"
      >
        <p className="text-sm text-ink-muted">
          The patient will have no oxygen order in effect until a new one is written. The bedside
          settings stay as they are; tell the bedside team.
        </p>
        <Field
          id="discontinue-reason"
          label="Reason"
          hint="Recorded in the ledger (5 to 1000 characters)."
          error={errors.reason?.message}
        >
          {(d, invalid) => (
            <textarea
              id="discontinue-reason"
              rows={2}
              className={inputClasses}
              aria-invalid={invalid}
              aria-describedby={d}
              {...form.register("reason")}
            />
          )}
        </Field>
        <SignPasswordField
          id="discontinue-password"
          label="Password to sign"
          error={errors.password?.message}
          registration={form.register("password")}
        />
        <SignedStepFooter
          orderId={orderId}
          state={state}
          submitting={form.formState.isSubmitting}
          label="Discontinue order"
          busyLabel="Discontinuing…"
          doneText="Discontinued."
          variant="danger"
        />
      </form>
    </details>
  );
}

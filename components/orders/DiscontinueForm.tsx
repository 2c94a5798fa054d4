"use client";

import { zodResolver } from "@hookform/resolvers/zod";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { useForm } from "react-hook-form";
import { discontinueOrderAction } from "@/app/(app)/orders/actions";
import { Button } from "@/components/ui/Button";
import { Field, inputClasses } from "@/components/ui/Field";
import { discontinueSchema } from "@/lib/orders/schema";

const formSchema = discontinueSchema.pick({ reason: true, password: true });
type DiscontinueValues = { reason: string; password: string };
const FIELDS = ["reason", "password"] as const;

/**
 * A physician stops the order in effect: a reason and the password. Tucked in a
 * disclosure so it is never pressed by accident; the reason stays if refused.
 */
export function DiscontinueForm({ orderId, version }: { orderId: number; version: number }) {
  const router = useRouter();
  const [formError, setFormError] = useState<string | null>(null);
  const [conflict, setConflict] = useState(false);
  const [done, setDone] = useState(false);
  const {
    register,
    handleSubmit,
    setError,
    setValue,
    formState: { errors, isSubmitting },
  } = useForm<DiscontinueValues>({
    resolver: zodResolver(formSchema),
    defaultValues: { reason: "", password: "" },
  });

  const onSubmit = handleSubmit(async (values) => {
    setFormError(null);
    setConflict(false);
    let result: Awaited<ReturnType<typeof discontinueOrderAction>>;
    try {
      result = await discontinueOrderAction({ orderId, version, ...values });
    } catch {
      setFormError("Tidemark could not be reached. Nothing was changed; try again.");
      return;
    }
    if (result.ok) {
      setDone(true);
      setValue("password", "");
      router.refresh();
      return;
    }
    setConflict(result.status === 409);
    let focused = false;
    for (const [path, messages] of Object.entries(result.fieldErrors ?? {})) {
      const field = FIELDS.find((f) => f === path);
      if (!field) continue;
      if (field === "password") setValue("password", "");
      setError(field, { type: "server", message: messages.join(" ") }, { shouldFocus: !focused });
      focused = true;
    }
    setFormError(result.message);
  });

  return (
    <details className="rounded-card border border-border bg-surface p-4 shadow-card">
      <summary className="cursor-pointer text-base font-semibold">Discontinue this order…</summary>
      <form onSubmit={onSubmit} noValidate aria-label="Discontinue order" className="mt-3 space-y-3">
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
              {...register("reason")}
            />
          )}
        </Field>
        <div className="max-w-sm">
          <Field id="discontinue-password" label="Password to sign" error={errors.password?.message}>
            {(d, invalid) => (
              <input
                id="discontinue-password"
                type="password"
                autoComplete="current-password"
                className={inputClasses}
                aria-invalid={invalid}
                aria-describedby={d}
                {...register("password")}
              />
            )}
          </Field>
        </div>
        <div className="flex flex-wrap items-center gap-3">
          <Button type="submit" variant="danger" disabled={isSubmitting || done}>
            {isSubmitting ? "Discontinuing…" : "Discontinue order"}
          </Button>
          <p role="status" aria-live="polite" className="text-sm">
            {formError ? <span className="font-medium text-below">{formError}</span> : null}
            {conflict ? (
              <a href={`/orders/${orderId}`} className="ml-2 text-accent underline underline-offset-2">
                Reload the order
              </a>
            ) : null}
            {done ? <span className="text-in-band">Discontinued.</span> : null}
          </p>
        </div>
      </form>
    </details>
  );
}

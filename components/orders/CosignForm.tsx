"use client";

import { zodResolver } from "@hookform/resolvers/zod";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { useForm } from "react-hook-form";
import { cosignOrderAction } from "@/app/(app)/orders/actions";
import { Button } from "@/components/ui/Button";
import { Field, inputClasses } from "@/components/ui/Field";
import { SIGNATURE_MEANING } from "@/lib/orders/devices";
import { cosignSchema } from "@/lib/orders/schema";

const formSchema = cosignSchema.pick({ password: true });
type CosignValues = { password: string };

/** A physician co-signs a verbal or telephone order by re-entering the password. */
export function CosignForm({
  orderId,
  version,
  enteredBy,
}: {
  orderId: number;
  version: number;
  enteredBy: string;
}) {
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
  } = useForm<CosignValues>({ resolver: zodResolver(formSchema), defaultValues: { password: "" } });

  const onSubmit = handleSubmit(async ({ password }) => {
    setFormError(null);
    setConflict(false);
    let result: Awaited<ReturnType<typeof cosignOrderAction>>;
    try {
      result = await cosignOrderAction({ orderId, version, password });
    } catch {
      setFormError("Tidemark could not be reached. Nothing was signed; try again.");
      return;
    }
    if (result.ok) {
      setDone(true);
      setValue("password", "");
      router.refresh();
      return;
    }
    setConflict(result.status === 409);
    const passwordError = result.fieldErrors?.password;
    if (passwordError) {
      setValue("password", "");
      setError("password", { type: "server", message: passwordError.join(" ") }, { shouldFocus: true });
    }
    setFormError(result.message);
  });

  return (
    <form
      onSubmit={onSubmit}
      noValidate
      aria-labelledby="cosign-heading"
      className="space-y-3 rounded-card border border-overdue/50 bg-surface p-4 shadow-card"
    >
      <h2 id="cosign-heading" className="text-base font-semibold">
        Co-sign this order
      </h2>
      <p className="text-sm text-ink-muted">
        Entered by {enteredBy} from your verbal or telephone order. Check every field above against what
        you ordered; co-signing makes it active and records you as its signer.
      </p>
      <p id="cosign-meaning" className="rounded-md bg-accent-soft px-3 py-2 text-sm">
        By co-signing you state: <q>{SIGNATURE_MEANING}</q>
      </p>
      <div className="max-w-sm">
        <Field
          id="cosign-password"
          label="Password to co-sign"
          hint="Your sign-in password, asked again."
          error={errors.password?.message}
        >
          {(d, invalid) => (
            <input
              id="cosign-password"
              type="password"
              autoComplete="current-password"
              className={inputClasses}
              aria-invalid={invalid}
              aria-describedby={[d, "cosign-meaning"].filter(Boolean).join(" ")}
              {...register("password")}
            />
          )}
        </Field>
      </div>
      <div className="flex flex-wrap items-center gap-3">
        <Button type="submit" disabled={isSubmitting || done}>
          {isSubmitting ? "Co-signing…" : "Co-sign order"}
        </Button>
        <p role="status" aria-live="polite" className="text-sm">
          {formError ? <span className="font-medium text-below">{formError}</span> : null}
          {conflict ? (
            <a href={`/orders/${orderId}`} className="ml-2 text-accent underline underline-offset-2">
              Reload the order
            </a>
          ) : null}
          {done ? <span className="text-in-band">Co-signed. The order is active.</span> : null}
        </p>
      </div>
    </form>
  );
}

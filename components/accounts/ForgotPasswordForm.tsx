"use client";

import { zodResolver } from "@hookform/resolvers/zod";
import Link from "next/link";
import { useState } from "react";
import { useForm } from "react-hook-form";
import { Button } from "@/components/ui/Button";
import { Field, inputClasses } from "@/components/ui/Field";
import { resetRequestSchema, type ResetRequestInput } from "@/lib/accounts/schema";
import { postJson } from "./post-json";

/** "Forgot password": one field; the answer is the same whether or not the address has an account. */
export function ForgotPasswordForm() {
  const [answer, setAnswer] = useState<string | null>(null);
  const [formError, setFormError] = useState<string | null>(null);
  const {
    register,
    handleSubmit,
    formState: { errors, isSubmitting },
  } = useForm<ResetRequestInput>({
    resolver: zodResolver(resetRequestSchema),
    defaultValues: { email: "" },
  });

  const onSubmit = handleSubmit(async (values) => {
    setFormError(null);
    const result = await postJson("/api/auth/reset", values);
    if (!result.ok) {
      setFormError(result.fieldErrors.email?.join(" ") ?? result.message);
      return;
    }
    setAnswer(String(result.data.message));
  });

  if (answer) {
    return (
      <div className="space-y-4">
        <p role="status" className="text-sm" data-testid="reset-answer">
          {answer}
        </p>
        <Link
          href="/sign-in"
          className="text-sm font-medium text-accent underline-offset-2 hover:underline"
        >
          Back to sign-in
        </Link>
      </div>
    );
  }
  return (
    <form onSubmit={onSubmit} noValidate className="space-y-3" aria-describedby="forgot-error">
      <Field id="email" label="E-mail" error={errors.email?.message}>
        {(describedBy, invalid) => (
          <input
            id="email"
            type="email"
            autoComplete="username"
            autoFocus
            className={inputClasses}
            aria-invalid={invalid}
            aria-describedby={describedBy}
            {...register("email")}
          />
        )}
      </Field>
      <p id="forgot-error" role="alert" className="min-h-5 text-sm font-medium text-below">
        {formError ?? ""}
      </p>
      <Button type="submit" className="w-full" disabled={isSubmitting}>
        {isSubmitting ? "Sending…" : "E-mail me a link"}
      </Button>
      <p className="text-center text-sm">
        <Link href="/sign-in" className="text-accent underline-offset-2 hover:underline">
          Back to sign-in
        </Link>
      </p>
    </form>
  );
}

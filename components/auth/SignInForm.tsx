"use client";

import { zodResolver } from "@hookform/resolvers/zod";
import { signIn } from "next-auth/react";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { useForm } from "react-hook-form";
import { Button } from "@/components/ui/Button";
import { Field, inputClasses } from "@/components/ui/Field";
import { signInSchema, type SignInInput } from "@/lib/auth/schema";

export function SignInForm({ callbackUrl, email = "" }: { callbackUrl: string; email?: string }) {
  const router = useRouter();
  const [formError, setFormError] = useState<string | null>(null);
  const {
    register,
    handleSubmit,
    formState: { errors, isSubmitting },
  } = useForm<SignInInput>({
    resolver: zodResolver(signInSchema),
    defaultValues: { email, password: "" },
  });

  const onSubmit = handleSubmit(async (values) => {
    setFormError(null);
    const result = await signIn("credentials", { ...values, redirect: false, callbackUrl });
    if (!result || result.error) {
      // The server's message never says whether the e-mail exists.
      setFormError(
        result?.error && result.error !== "CredentialsSignin"
          ? result.error
          : "That e-mail and password do not match an active account.",
      );
      return;
    }
    router.replace(callbackUrl);
    router.refresh();
  });

  return (
    <form onSubmit={onSubmit} noValidate className="space-y-3" aria-describedby="sign-in-error">
      <Field id="email" label="E-mail" error={errors.email?.message}>
        {(describedBy, invalid) => (
          <input
            id="email"
            type="email"
            autoComplete="username"
            autoFocus={!email}
            className={inputClasses}
            aria-invalid={invalid}
            aria-describedby={describedBy}
            {...register("email")}
          />
        )}
      </Field>
      <Field id="password" label="Password" error={errors.password?.message}>
        {(describedBy, invalid) => (
          <input
            id="password"
            type="password"
            autoComplete="current-password"
            className={inputClasses}
            aria-invalid={invalid}
            aria-describedby={describedBy}
            {...register("password")}
          />
        )}
      </Field>
      <p id="sign-in-error" role="alert" className="min-h-5 text-sm font-medium text-below">
        {formError ?? ""}
      </p>
      <Button type="submit" className="w-full" disabled={isSubmitting}>
        {isSubmitting ? "Signing in…" : "Sign in"}
      </Button>
    </form>
  );
}

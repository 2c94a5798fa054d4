"use client";

import { zodResolver } from "@hookform/resolvers/zod";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { useForm } from "react-hook-form";
import { Button } from "@/components/ui/Button";
import { tokenPasswordSchema, type TokenPasswordInput } from "@/lib/accounts/schema";
import { NewPasswordFields } from "./NewPasswordFields";
import { postJson } from "./post-json";

const FIELDS = ["password", "confirmPassword"] as const;

/** The page an e-mailed link opens: choose the password; then sign in with it. */
export function SetPasswordForm({ token, email }: { token: string; email: string }) {
  const router = useRouter();
  const [formError, setFormError] = useState<string | null>(null);
  const {
    register,
    handleSubmit,
    setError,
    formState: { errors, isSubmitting },
  } = useForm<TokenPasswordInput>({
    resolver: zodResolver(tokenPasswordSchema),
    defaultValues: { token, password: "", confirmPassword: "" },
  });

  const onSubmit = handleSubmit(async (values) => {
    setFormError(null);
    const result = await postJson("/api/auth/password", values);
    if (!result.ok) {
      setFormError(result.fieldErrors.token?.join(" ") ?? result.message);
      for (const f of FIELDS) {
        const messages = result.fieldErrors[f];
        if (messages) setError(f, { type: "server", message: messages.join(" ") });
      }
      return;
    }
    router.push(`/sign-in?password=set&email=${encodeURIComponent(email)}`);
  });

  return (
    <form onSubmit={onSubmit} noValidate className="space-y-3" aria-describedby="set-error">
      <input type="hidden" {...register("token")} />
      {/* For password managers: the account the new password belongs to. */}
      <input type="email" autoComplete="username" value={email} readOnly hidden />
      <NewPasswordFields register={register} errors={errors} />
      <p id="set-error" role="alert" className="min-h-5 text-sm font-medium text-below">
        {formError ?? ""}
      </p>
      <Button type="submit" className="w-full" disabled={isSubmitting}>
        {isSubmitting ? "Saving…" : "Set password"}
      </Button>
    </form>
  );
}

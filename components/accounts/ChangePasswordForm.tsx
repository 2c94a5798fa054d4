"use client";

import { zodResolver } from "@hookform/resolvers/zod";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { useForm } from "react-hook-form";
import { Button } from "@/components/ui/Button";
import { Field, inputClasses } from "@/components/ui/Field";
import { changePasswordAction } from "@/lib/accounts/actions";
import { changePasswordSchema, type ChangePasswordInput } from "@/lib/accounts/schema";
import { NewPasswordFields } from "./NewPasswordFields";

const FIELDS = ["currentPassword", "password", "confirmPassword"] as const;

/** One's own password: the current one, then the new one twice. */
export function ChangePasswordForm({ next }: { next: string }) {
  const router = useRouter();
  const [formError, setFormError] = useState<string | null>(null);
  const [done, setDone] = useState(false);
  const {
    register,
    handleSubmit,
    setError,
    formState: { errors, isSubmitting },
  } = useForm<ChangePasswordInput>({
    resolver: zodResolver(changePasswordSchema),
    defaultValues: { currentPassword: "", password: "", confirmPassword: "" },
  });

  const onSubmit = handleSubmit(async (values) => {
    setFormError(null);
    const result = await changePasswordAction(values);
    if (!result.ok) {
      setFormError(result.message);
      for (const f of FIELDS) {
        const messages = result.fieldErrors?.[f];
        if (messages) setError(f, { type: "server", message: messages.join(" ") });
      }
      return;
    }
    setDone(true);
    router.replace(next);
    router.refresh();
  });

  return (
    <form onSubmit={onSubmit} noValidate className="space-y-3" aria-describedby="change-error">
      <Field id="currentPassword" label="Current password" error={errors.currentPassword?.message}>
        {(d, invalid) => (
          <input
            id="currentPassword"
            type="password"
            autoComplete="current-password"
            autoFocus
            className={inputClasses}
            aria-invalid={invalid}
            aria-describedby={d}
            {...register("currentPassword")}
          />
        )}
      </Field>
      <NewPasswordFields register={register} errors={errors} />
      <p id="change-error" role="alert" className="min-h-5 text-sm font-medium text-below">
        {formError ?? ""}
      </p>
      <p role="status" className="sr-only">
        {done ? "Password changed." : ""}
      </p>
      <Button type="submit" className="w-full" disabled={isSubmitting || done}>
        {isSubmitting ? "Saving…" : done ? "Password changed" : "Change password"}
      </Button>
    </form>
  );
}

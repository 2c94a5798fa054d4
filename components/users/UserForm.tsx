"use client";

import { zodResolver } from "@hookform/resolvers/zod";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { Controller, useForm, type Resolver } from "react-hook-form";
import { createUserAction, updateUserAction } from "@/lib/users/actions";
import { useHydrated } from "@/components/bedside/BedsideFormParts";
import { Button } from "@/components/ui/Button";
import { Field, inputClasses } from "@/components/ui/Field";
import { ROLE_LABELS, ROLES } from "@/lib/auth/roles";
import type { UserSummary } from "@/lib/users/queries";
import { UnitCheckboxes } from "@/components/units/UnitCheckboxes";
import {
  PASSWORD_MIN,
  userCreateSchema,
  userUpdateSchema,
  type UserFormValues,
} from "@/lib/users/schema";
import { OwnPasswordField } from "@/components/ui/OwnPasswordField";

type Props =
  | { mode: "create"; units: { id: number; label: string }[]; user?: undefined }
  | { mode: "edit"; units: { id: number; label: string }[]; user: UserSummary };

const FIELDS = [
  "email",
  "name",
  "role",
  "unitIds",
  "pressureUnit",
  "rationale",
  "password",
  "currentPassword",
  "invite",
] as const;

/** Create or edit an account. Server refusals land beside the fields; typed values stay. */
export function UserForm({ mode, units, user }: Props) {
  const router = useRouter();
  // Disabled until hydrated: an early Enter would submit natively, putting the values into the URL.
  const hydrated = useHydrated();
  const [formError, setFormError] = useState<string | null>(null);
  const [saved, setSaved] = useState<string | null>(null);
  const schema =
    mode === "create" ? userCreateSchema : userUpdateSchema.omit({ id: true, version: true });
  const {
    register,
    control,
    handleSubmit,
    setError,
    reset,
    watch,
    formState: { errors, isSubmitting, isDirty },
  } = useForm<UserFormValues>({
    resolver: zodResolver(schema) as unknown as Resolver<UserFormValues>,
    defaultValues: {
      email: user?.email ?? "",
      name: user?.name ?? "",
      role: user?.role ?? "nurse",
      unitIds: user?.units.map((u) => u.id) ?? [],
      pressureUnit: user?.pressureUnit ?? "mmHg",
      rationale: "",
      password: "",
      currentPassword: "",
      ...(mode === "create" ? { invite: false } : {}),
    },
  });
  const inviting = mode === "create" && watch("invite") === true;

  const onSubmit = handleSubmit(async (values) => {
    setFormError(null);
    setSaved(null);
    const result =
      mode === "create"
        ? await createUserAction(values)
        : await updateUserAction({ ...values, id: user.id, version: user.version });
    if (!result.ok) {
      setFormError(result.message);
      for (const [path, messages] of Object.entries(result.fieldErrors ?? {})) {
        const field = FIELDS.find((f) => f === path);
        if (field) setError(field, { type: "server", message: messages.join(" ") });
      }
      return;
    }
    if (mode === "create") {
      router.push(`/admin/users/${result.data.id}`);
    } else {
      setSaved(`Saved. ${result.data.name}'s account is up to date.`);
      reset({ ...values, password: "", rationale: "", currentPassword: "" });
    }
    router.refresh();
  });

  return (
    <form
      onSubmit={onSubmit}
      noValidate
      data-ready={hydrated ? "true" : undefined}
      className="rounded-card border border-border bg-surface p-5 shadow-card"
    >
      <fieldset disabled={!hydrated} className="min-w-0 space-y-4">
        <div className="grid gap-x-4 sm:grid-cols-2">
          <Field id="name" label="Full name" error={errors.name?.message}>
            {(d, invalid) => (
              <input
                id="name"
                className={inputClasses}
                aria-invalid={invalid}
                aria-describedby={d}
                {...register("name")}
              />
            )}
          </Field>
          <Field id="email" label="E-mail (sign-in)" error={errors.email?.message}>
            {(d, invalid) => (
              <input
                id="email"
                type="email"
                autoComplete="off"
                className={inputClasses}
                aria-invalid={invalid}
                aria-describedby={d}
                {...register("email")}
              />
            )}
          </Field>
          <Field id="role" label="Role" error={errors.role?.message}>
            {(d, invalid) => (
              <select
                id="role"
                className={inputClasses}
                aria-invalid={invalid}
                aria-describedby={d}
                {...register("role")}
              >
                {ROLES.map((r) => (
                  <option key={r} value={r}>
                    {ROLE_LABELS[r]}
                  </option>
                ))}
              </select>
            )}
          </Field>
          <Field id="pressureUnit" label="Pressures shown in" error={errors.pressureUnit?.message}>
            {(d, invalid) => (
              <select
                id="pressureUnit"
                className={inputClasses}
                aria-invalid={invalid}
                aria-describedby={d}
                {...register("pressureUnit")}
              >
                <option value="mmHg">mmHg</option>
                <option value="kPa">kPa</option>
              </select>
            )}
          </Field>
        </div>

        <Controller
          control={control}
          name="unitIds"
          render={({ field }) => (
            <UnitCheckboxes
              units={units}
              value={field.value}
              onChange={field.onChange}
              onBlur={field.onBlur}
              errorId="unitIds-error"
              error={errors.unitIds?.message}
            />
          )}
        />

        {mode === "create" ? (
          <div className="flex items-start gap-2">
            <input
              id="invite"
              type="checkbox"
              className="mt-1 size-4 accent-accent"
              aria-describedby="invite-hint"
              {...register("invite")}
            />
            <div>
              <label htmlFor="invite" className="text-sm font-medium text-ink">
                E-mail an invitation to choose a password
              </label>
              <p id="invite-hint" className="text-xs text-ink-muted">
                The person gets a link that works once; no password is shared. Otherwise set an
                initial password below, which they must change when they first sign in.
              </p>
            </div>
          </div>
        ) : null}

        <div className="grid gap-x-4 sm:grid-cols-2">
          {inviting ? null : (
            <Field
              id="password"
              label={mode === "create" ? "Initial password" : "New password"}
              hint={
                mode === "create"
                  ? `${PASSWORD_MIN} to 200 characters; share it with the person privately. They choose their own at first sign-in.`
                  : "Leave empty to keep the current password. A password you set here must be changed at the next sign-in."
              }
              error={errors.password?.message}
            >
              {(d, invalid) => (
                <input
                  id="password"
                  type="password"
                  autoComplete="new-password"
                  className={inputClasses}
                  aria-invalid={invalid}
                  aria-describedby={d}
                  {...register("password")}
                />
              )}
            </Field>
          )}
          <Field
            id="rationale"
            label="Reason for the change (optional)"
            hint="Recorded in the ledger."
            error={errors.rationale?.message}
          >
            {(d, invalid) => (
              <input
                id="rationale"
                className={inputClasses}
                aria-invalid={invalid}
                aria-describedby={d}
                {...register("rationale")}
              />
            )}
          </Field>
        </div>

        <OwnPasswordField
          id="currentPassword"
          hint="Account changes are confirmed with your own password; a wrong one is recorded."
          error={errors.currentPassword?.message}
          className="sm:max-w-xs"
          input={register("currentPassword")}
        />

        <div className="flex flex-wrap items-center gap-3">
          <Button type="submit" disabled={isSubmitting || (mode === "edit" && !isDirty)}>
            {isSubmitting
              ? "Saving…"
              : mode === "create"
                ? inviting
                  ? "Create user and send invitation"
                  : "Create user"
                : "Save changes"}
          </Button>
          <p role="status" aria-live="polite" className="text-sm">
            {formError ? <span className="font-medium text-below">{formError}</span> : null}
            {saved ? <span className="text-in-band">{saved}</span> : null}
          </p>
        </div>
      </fieldset>
    </form>
  );
}

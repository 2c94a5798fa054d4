"use client";

import { zodResolver } from "@hookform/resolvers/zod";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { Controller, useForm, type Resolver } from "react-hook-form";
import { createApiTokenAction } from "@/lib/api-tokens/actions";
import { useHydrated } from "@/components/bedside/BedsideFormParts";
import { Button } from "@/components/ui/Button";
import { Field, inputClasses } from "@/components/ui/Field";
import {
  apiTokenCreateSchema,
  TOKEN_DAYS_DEFAULT,
  TOKEN_DAYS_MAX,
  type ApiTokenScope,
} from "@/lib/api-tokens/schema";
import { UnitCheckboxes } from "@/components/units/UnitCheckboxes";
import { toNumber } from "@/lib/number-input";
import { OwnPasswordField } from "@/components/ui/OwnPasswordField";

type Values = {
  name: string;
  scope: ApiTokenScope;
  unitIds: number[];
  validDays: number;
  currentPassword: string;
};
const FIELDS = ["name", "scope", "unitIds", "validDays", "currentPassword"] as const;

/** Create a token; the secret is shown once, with a way to copy it. */
export function ApiTokenForm({ units }: { units: { id: number; label: string }[] }) {
  const router = useRouter();
  const hydrated = useHydrated();
  const [formError, setFormError] = useState<string | null>(null);
  const [created, setCreated] = useState<{ name: string; token: string } | null>(null);
  const [copied, setCopied] = useState(false);
  const {
    register,
    control,
    handleSubmit,
    setError,
    reset,
    formState: { errors, isSubmitting },
  } = useForm<Values>({
    resolver: zodResolver(apiTokenCreateSchema) as unknown as Resolver<Values>,
    defaultValues: {
      name: "",
      scope: "write",
      unitIds: [],
      validDays: TOKEN_DAYS_DEFAULT,
      currentPassword: "",
    },
  });

  const onSubmit = handleSubmit(async (values) => {
    setFormError(null);
    setCopied(false);
    const result = await createApiTokenAction(values);
    if (!result.ok) {
      setFormError(result.message);
      for (const [path, messages] of Object.entries(result.fieldErrors ?? {})) {
        const field = FIELDS.find((f) => f === path);
        if (field) setError(field, { type: "server", message: messages.join(" ") });
      }
      return;
    }
    setCreated({ name: result.data.summary.name, token: result.data.token });
    reset();
    router.refresh();
  });

  return (
    <div className="space-y-3">
      {created ? (
        <div
          role="alert"
          className="space-y-2 rounded-card border border-in-band/50 bg-in-band-soft p-4"
        >
          <p className="text-sm font-medium">
            Token “{created.name}” created. Copy it now: it is shown only this once and cannot be
            recovered.
          </p>
          <div className="flex flex-wrap items-center gap-2">
            <code
              className="rounded bg-surface px-2 py-1 font-mono text-sm break-all"
              data-testid="new-token"
            >
              {created.token}
            </code>
            <Button
              variant="secondary"
              onClick={() => {
                void navigator.clipboard?.writeText(created.token).then(() => setCopied(true));
              }}
            >
              {copied ? "Copied" : "Copy"}
            </Button>
            <Button variant="ghost" onClick={() => setCreated(null)}>
              Done, hide it
            </Button>
          </div>
        </div>
      ) : null}
      <form
        onSubmit={onSubmit}
        noValidate
        data-ready={hydrated ? "true" : undefined}
        className="rounded-card border border-border bg-surface p-5 shadow-card"
        aria-labelledby="new-token-title"
      >
        <h2 id="new-token-title" className="mb-3 text-lg font-semibold">
          New token
        </h2>
        <fieldset disabled={!hydrated} className="min-w-0 space-y-3">
          <div className="grid gap-x-4 sm:grid-cols-2">
            <Field
              id="token-name"
              label="Name"
              hint="Which interface engine or device uses it."
              error={errors.name?.message}
            >
              {(d, invalid) => (
                <input
                  id="token-name"
                  className={inputClasses}
                  aria-invalid={invalid}
                  aria-describedby={d}
                  {...register("name")}
                />
              )}
            </Field>
            <Field id="token-scope" label="Scope" error={errors.scope?.message}>
              {(d, invalid) => (
                <select
                  id="token-scope"
                  className={inputClasses}
                  aria-invalid={invalid}
                  aria-describedby={d}
                  {...register("scope")}
                >
                  <option value="write">Write (send imports)</option>
                  <option value="read">Read only (FHIR export)</option>
                </select>
              )}
            </Field>
          </div>
          <Field
            id="token-valid-days"
            label="Valid for (days)"
            hint={`${TOKEN_DAYS_DEFAULT} days unless you choose otherwise; at most ${TOKEN_DAYS_MAX}. After that the token is refused.`}
            error={errors.validDays?.message}
          >
            {(d, invalid) => (
              <input
                id="token-valid-days"
                type="number"
                inputMode="numeric"
                min={1}
                max={TOKEN_DAYS_MAX}
                step={1}
                className={`${inputClasses} tabular sm:w-40`}
                aria-invalid={invalid}
                aria-describedby={d}
                {...register("validDays", { setValueAs: toNumber })}
              />
            )}
          </Field>
          <Controller
            control={control}
            name="unitIds"
            render={({ field }) => (
              <UnitCheckboxes
                units={units}
                value={field.value}
                onChange={field.onChange}
                onBlur={field.onBlur}
                errorId="token-units-error"
                error={errors.unitIds?.message}
              />
            )}
          />
          <OwnPasswordField
            id="token-current-password"
            hint="Token changes are confirmed with your own password; a wrong one is recorded."
            error={errors.currentPassword?.message}
            className="sm:max-w-xs"
            input={register("currentPassword")}
          />
          <div className="flex flex-wrap items-center gap-3">
            <Button type="submit" disabled={isSubmitting}>
              {isSubmitting ? "Creating…" : "Create token"}
            </Button>
            <p role="status" aria-live="polite" className="text-sm">
              {formError ? <span className="font-medium text-below">{formError}</span> : null}
            </p>
          </div>
        </fieldset>
      </form>
    </div>
  );
}

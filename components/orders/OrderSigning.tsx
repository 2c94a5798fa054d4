"use client";

import type { FieldErrors, UseFormRegister } from "react-hook-form";
import { Field, inputClasses } from "@/components/ui/Field";
import { SIGNATURE_MEANING } from "@/lib/orders/wording";
import type { ComposerValues, PhysicianChoice } from "./order-form";
import { ChoiceGroup, Section } from "./OrderComposerFields";

/**
 * How the order is signed: the physician's own signature with their password,
 * or a nurse's/therapist's verbal or telephone order, read back to the physician.
 */
export function SigningSection({
  signer,
  register,
  errors,
  prescriberId,
  physicians,
}: {
  signer: "physician" | "other";
  register: UseFormRegister<ComposerValues>;
  errors: FieldErrors<ComposerValues>;
  prescriberId: string | undefined;
  physicians: PhysicianChoice[];
}) {
  const prescriber = physicians.find((p) => String(p.id) === prescriberId);

  return signer === "physician" ? (
    <Section title="Signature">
      <p className="mb-2 rounded-md bg-accent-soft px-3 py-2 text-sm" id="order-signature-meaning">
        By signing you state: <q>{SIGNATURE_MEANING}</q>
      </p>
      <div className="grid gap-x-4 sm:grid-cols-2">
        <Field
          id="order-password"
          label="Password to sign"
          hint="Your sign-in password, asked again: the signature is your own act."
          error={errors.password?.message}
        >
          {(d, invalid) => (
            <input
              id="order-password"
              type="password"
              autoComplete="current-password"
              className={inputClasses}
              aria-invalid={invalid}
              aria-describedby={[d, "order-signature-meaning"].filter(Boolean).join(" ")}
              {...register("password")}
            />
          )}
        </Field>
      </div>
    </Section>
  ) : (
    <Section title="Verbal or telephone order">
      <p className="mb-2 text-sm text-ink-muted">
        The order takes effect marked &ldquo;Awaiting co-sign&rdquo; until the physician co-signs
        it.
      </p>
      <div className="grid gap-x-4 sm:grid-cols-2">
        <ChoiceGroup
          legend="How the order was given"
          errorId="order-entryMode-error"
          error={errors.entryMode?.message}
          inline
        >
          <label className="flex items-center gap-2 text-sm">
            <input
              type="radio"
              value="verbal"
              className="size-4 accent-accent"
              {...register("entryMode")}
            />
            Verbal (in person)
          </label>
          <label className="flex items-center gap-2 text-sm">
            <input
              type="radio"
              value="telephone"
              className="size-4 accent-accent"
              {...register("entryMode")}
            />
            Telephone
          </label>
        </ChoiceGroup>
        <Field
          id="order-prescriberId"
          label="Ordering physician"
          error={errors.prescriberId?.message}
        >
          {(d, invalid) => (
            <select
              id="order-prescriberId"
              className={inputClasses}
              aria-invalid={invalid}
              aria-describedby={d}
              {...register("prescriberId")}
            >
              <option value="">Choose the physician…</option>
              {physicians.map((p) => (
                <option key={p.id} value={String(p.id)}>
                  {p.name}
                  {p.onDuty ? " (on duty for this bed)" : ""}
                </option>
              ))}
            </select>
          )}
        </Field>
      </div>
      <div className="mt-1">
        <label className="flex items-start gap-2 text-sm">
          <input
            type="checkbox"
            className="mt-0.5 size-4 shrink-0 accent-accent"
            aria-invalid={Boolean(errors.readBackConfirmed)}
            aria-describedby={
              errors.readBackConfirmed ? "order-readBackConfirmed-error" : "order-readback-hint"
            }
            {...register("readBackConfirmed")}
          />
          <span>
            I read the order back to {prescriber ? prescriber.name : "the physician"} and they
            confirmed it.
          </span>
        </label>
        <p id="order-readback-hint" className="ml-6 text-xs text-ink-muted">
          Read back “Your order, in words” as it stands.
        </p>
        <p
          id="order-readBackConfirmed-error"
          className="ml-6 min-h-4 text-xs font-medium text-below"
          aria-live="polite"
        >
          {errors.readBackConfirmed?.message ?? ""}
        </p>
      </div>
    </Section>
  );
}

"use client";

import { zodResolver } from "@hookform/resolvers/zod";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { Controller, useForm, type Resolver } from "react-hook-form";
import { useHydrated } from "@/components/bedside/BedsideFormParts";
import { Button } from "@/components/ui/Button";
import { Field, inputClasses } from "@/components/ui/Field";
import { DEVICE_PROFILES, DEVICES, type Device } from "@/lib/devices";
import { createUnitAction, updateUnitAction } from "@/lib/units/actions";
import type { DeviceWarning, UnitDetail } from "@/lib/units/queries";
import {
  ALTITUDE_RANGE,
  MAX_INITIAL_BEDS,
  unitCreateSchema,
  unitFieldsSchema,
  type UnitFormValues,
} from "@/lib/units/schema";
import { SHIFT_HOURS } from "@/lib/units/shifts";

type Values = UnitFormValues & { code?: string; initialBeds?: number };

type Props = { mode: "create"; unit?: undefined } | { mode: "edit"; unit: UnitDetail };

const FIELDS = [
  "code",
  "name",
  "kind",
  "altitudeM",
  "timeZone",
  "shiftStart",
  "shiftHours",
  "allowedDevices",
  "fallbackEmail",
  "rationale",
  "initialBeds",
] as const;

/** Zone names the runtime knows, offered as suggestions; any IANA name the server knows is taken. */
function zoneSuggestions(): string[] {
  try {
    return Intl.supportedValuesOf("timeZone");
  } catch {
    return ["UTC"];
  }
}

/** Create a unit, or edit its settings (the code stays). Server refusals land beside the fields. */
export function UnitForm({ mode, unit }: Props) {
  const router = useRouter();
  // Disabled until hydrated: an early Enter would submit natively, putting the values into the URL.
  const hydrated = useHydrated();
  const [formError, setFormError] = useState<string | null>(null);
  const [saved, setSaved] = useState<string | null>(null);
  const [warnings, setWarnings] = useState<DeviceWarning[]>([]);
  const schema = mode === "create" ? unitCreateSchema : unitFieldsSchema;
  const {
    register,
    control,
    handleSubmit,
    setError,
    reset,
    formState: { errors, isSubmitting, isDirty },
  } = useForm<Values>({
    resolver: zodResolver(schema) as unknown as Resolver<Values>,
    defaultValues: {
      ...(mode === "create" ? { code: "", initialBeds: 0 } : {}),
      name: unit?.name ?? "",
      kind: unit?.kind ?? "icu",
      altitudeM: unit?.altitudeM ?? 0,
      timeZone: unit?.timeZone ?? "UTC",
      shiftStart: unit?.shiftStart ?? "07:00",
      shiftHours: unit?.shiftHours ?? 12,
      allowedDevices: unit?.allowedDevices ?? [...DEVICES],
      fallbackEmail: unit?.fallbackEmail ?? "",
      rationale: "",
    },
  });

  const onSubmit = handleSubmit(async (values) => {
    setFormError(null);
    setSaved(null);
    setWarnings([]);
    const result =
      mode === "create"
        ? await createUnitAction(values)
        : await updateUnitAction({ ...values, unitId: unit.id, version: unit.version });
    if (!result.ok) {
      setFormError(result.message);
      for (const [path, messages] of Object.entries(result.fieldErrors ?? {})) {
        const field = FIELDS.find((f) => f === path || path.startsWith(`${f}.`));
        if (field) setError(field, { type: "server", message: messages.join(" ") });
      }
      return;
    }
    if (mode === "create") {
      router.push(`/admin/units/${(result.data as UnitDetail).id}`);
    } else {
      const { warnings: found } = result.data as { warnings: DeviceWarning[] };
      setWarnings(found);
      setSaved(`Saved. ${unit.code}'s settings are up to date.`);
      reset({ ...values, rationale: "" });
    }
    router.refresh();
  });

  const id = (name: string) => `unit-${name}`;

  return (
    <form
      onSubmit={onSubmit}
      noValidate
      data-ready={hydrated ? "true" : undefined}
      aria-label={mode === "create" ? "New unit" : `Settings of ${unit.code}`}
      className="rounded-card border border-border bg-surface p-5 shadow-card"
    >
      <fieldset disabled={!hydrated} className="min-w-0 space-y-4">
        <div className="grid gap-x-4 sm:grid-cols-2">
          {mode === "create" ? (
            <Field
              id={id("code")}
              label="Code"
              hint="2 to 16 upper-case letters or digits; cannot be changed later."
              error={errors.code?.message}
            >
              {(d, invalid) => (
                <input
                  id={id("code")}
                  autoComplete="off"
                  className={`${inputClasses} uppercase`}
                  aria-invalid={invalid}
                  aria-describedby={d}
                  {...register("code")}
                />
              )}
            </Field>
          ) : null}
          <Field id={id("name")} label="Name" error={errors.name?.message}>
            {(d, invalid) => (
              <input
                id={id("name")}
                className={inputClasses}
                aria-invalid={invalid}
                aria-describedby={d}
                {...register("name")}
              />
            )}
          </Field>
          <Field id={id("kind")} label="Kind" error={errors.kind?.message}>
            {(d, invalid) => (
              <select
                id={id("kind")}
                className={inputClasses}
                aria-invalid={invalid}
                aria-describedby={d}
                {...register("kind")}
              >
                <option value="icu">ICU</option>
                <option value="ward">Ward</option>
              </select>
            )}
          </Field>
          <Field
            id={id("altitudeM")}
            label="Altitude (m)"
            hint={`${ALTITUDE_RANGE.min} to ${ALTITUDE_RANGE.max} m; sets the barometric pressure the engine uses.`}
            error={errors.altitudeM?.message}
          >
            {(d, invalid) => (
              <input
                id={id("altitudeM")}
                type="number"
                inputMode="numeric"
                step={1}
                className={inputClasses}
                aria-invalid={invalid}
                aria-describedby={d}
                {...register("altitudeM", { valueAsNumber: true })}
              />
            )}
          </Field>
          <Field
            id={id("timeZone")}
            label="Time zone"
            hint="An IANA name, e.g. Europe/Amsterdam; shifts start on this clock."
            error={errors.timeZone?.message}
          >
            {(d, invalid) => (
              <>
                <input
                  id={id("timeZone")}
                  list={id("timeZone-list")}
                  autoComplete="off"
                  className={inputClasses}
                  aria-invalid={invalid}
                  aria-describedby={d}
                  {...register("timeZone")}
                />
                <datalist id={id("timeZone-list")}>
                  {hydrated ? zoneSuggestions().map((z) => <option key={z} value={z} />) : null}
                </datalist>
              </>
            )}
          </Field>
          <Field
            id={id("shiftStart")}
            label="First shift starts at"
            hint="HH:MM, 00:00 to 23:59, on the unit's clock."
            error={errors.shiftStart?.message}
          >
            {(d, invalid) => (
              <input
                id={id("shiftStart")}
                inputMode="numeric"
                placeholder="07:00"
                autoComplete="off"
                className={inputClasses}
                aria-invalid={invalid}
                aria-describedby={d}
                {...register("shiftStart")}
              />
            )}
          </Field>
          <Field id={id("shiftHours")} label="Shift length" error={errors.shiftHours?.message}>
            {(d, invalid) => (
              <select
                id={id("shiftHours")}
                className={inputClasses}
                aria-invalid={invalid}
                aria-describedby={d}
                {...register("shiftHours", { valueAsNumber: true })}
              >
                {SHIFT_HOURS.map((h) => (
                  <option key={h} value={h}>
                    {h} hours ({24 / h} a day)
                  </option>
                ))}
              </select>
            )}
          </Field>
          <Field
            id={id("fallbackEmail")}
            label="Fallback e-mail (optional)"
            hint="Receives alerts when a patient has no assigned nurse and the shift no charge nurse."
            error={errors.fallbackEmail?.message}
          >
            {(d, invalid) => (
              <input
                id={id("fallbackEmail")}
                type="email"
                autoComplete="off"
                className={inputClasses}
                aria-invalid={invalid}
                aria-describedby={d}
                {...register("fallbackEmail")}
              />
            )}
          </Field>
          {mode === "create" ? (
            <Field
              id={id("initialBeds")}
              label="Beds to start with"
              hint={`0 to ${MAX_INITIAL_BEDS}, labelled 1, 2, 3…; you can add and rename beds later.`}
              error={errors.initialBeds?.message}
            >
              {(d, invalid) => (
                <input
                  id={id("initialBeds")}
                  type="number"
                  inputMode="numeric"
                  min={0}
                  max={MAX_INITIAL_BEDS}
                  className={inputClasses}
                  aria-invalid={invalid}
                  aria-describedby={d}
                  {...register("initialBeds", { valueAsNumber: true })}
                />
              )}
            </Field>
          ) : null}
        </div>

        <Controller
          control={control}
          name="allowedDevices"
          render={({ field }) => (
            <DeviceCheckboxes
              value={field.value as Device[]}
              onChange={field.onChange}
              onBlur={field.onBlur}
              error={errors.allowedDevices?.message ?? errors.allowedDevices?.root?.message}
            />
          )}
        />

        <Field
          id={id("rationale")}
          label="Reason for the change (optional)"
          hint="Recorded in the ledger."
          error={errors.rationale?.message}
        >
          {(d, invalid) => (
            <input
              id={id("rationale")}
              className={inputClasses}
              aria-invalid={invalid}
              aria-describedby={d}
              {...register("rationale")}
            />
          )}
        </Field>

        <div className="flex flex-wrap items-center gap-3">
          <Button type="submit" disabled={isSubmitting || (mode === "edit" && !isDirty)}>
            {isSubmitting ? "Saving…" : mode === "create" ? "Create unit" : "Save settings"}
          </Button>
          <p role="status" aria-live="polite" className="text-sm">
            {formError ? <span className="font-medium text-below">{formError}</span> : null}
            {saved ? <span className="text-in-band">{saved}</span> : null}
          </p>
        </div>
        {warnings.length ? (
          <div
            role="alert"
            className="rounded-md border border-above bg-above-soft p-3 text-sm text-ink"
          >
            <p className="font-medium">
              Saved, but these patients have an order in effect with a device the unit no longer
              allows. Their orders stay in effect until a prescriber changes them:
            </p>
            <ul className="mt-1 list-disc pl-5">
              {warnings.map((w) => (
                <li key={w.patientId}>
                  Bed {w.bedLabel}: {w.name} (MRN {w.mrn}) — {DEVICE_PROFILES[w.device].label}
                </li>
              ))}
            </ul>
          </div>
        ) : null}
      </fieldset>
    </form>
  );
}

function DeviceCheckboxes({
  value,
  onChange,
  onBlur,
  error,
}: {
  value: readonly Device[];
  onChange: (next: Device[]) => void;
  onBlur: () => void;
  error?: string;
}) {
  return (
    <fieldset aria-describedby={error ? "unit-allowedDevices-error" : undefined}>
      <legend className="text-sm font-medium">Devices the unit allows</legend>
      <div className="mt-1 grid gap-x-4 gap-y-1 sm:grid-cols-2">
        {DEVICES.map((d) => (
          <label key={d} className="flex items-center gap-2 text-sm">
            <input
              type="checkbox"
              className="size-4 accent-accent"
              checked={value.includes(d)}
              onChange={(e) =>
                onChange(e.target.checked ? [...value, d] : value.filter((x) => x !== d))
              }
              onBlur={onBlur}
            />
            {DEVICE_PROFILES[d].label}
          </label>
        ))}
      </div>
      <p
        id="unit-allowedDevices-error"
        className="min-h-4 text-xs font-medium text-below"
        aria-live="polite"
      >
        {error ?? ""}
      </p>
    </fieldset>
  );
}

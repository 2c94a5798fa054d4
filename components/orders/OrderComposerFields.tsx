"use client";

import type { ReactNode } from "react";
import type { FieldErrors, UseFormRegister, UseFormRegisterReturn } from "react-hook-form";
import { Field, inputClasses } from "@/components/ui/Field";
import { DEVICE_PROFILES, DEVICES, type Device } from "@/lib/devices";
import { MMHG_PER_KPA, RANGES, type PressureUnit } from "@/lib/oxygen";
import {
  BAND_CHOICES,
  CUSTOM,
  percentOf,
  REASSESS_PRESETS,
  stepTableFits,
  type ComposerValues,
  type FormField,
  type StepTableChoice,
} from "./order-form";

// ---------------------------------------------------------------------------
// The composer's field groups: device and limits, target band, titration
// ---------------------------------------------------------------------------

/** A card holding one group of the order, named by its legend. */
export function Section({ title, children }: { title: string; children: ReactNode }) {
  return (
    <div className="rounded-card border border-border bg-surface p-4 shadow-card">
      <fieldset className="min-w-0">
        <legend className="mb-2 text-base font-semibold">{title}</legend>
        {children}
      </fieldset>
    </div>
  );
}

/** Radio buttons under one legend, with their error in words below. */
export function ChoiceGroup({
  legend,
  errorId,
  error,
  inline = false,
  children,
}: {
  legend: string;
  errorId: string;
  error: string | undefined;
  inline?: boolean;
  children: ReactNode;
}) {
  return (
    <fieldset aria-describedby={error ? errorId : undefined} className="min-w-0">
      <legend className="mb-1 text-sm font-medium">{legend}</legend>
      <div className={inline ? "flex flex-wrap gap-x-4 gap-y-1" : "space-y-1"}>{children}</div>
      <p id={errorId} className="min-h-4 text-xs font-medium text-below" aria-live="polite">
        {error ?? ""}
      </p>
    </fieldset>
  );
}

/** What a field group of the composer reads from its form. */
export type ComposerFormProps = {
  register: UseFormRegister<ComposerValues>;
  errors: FieldErrors<ComposerValues>;
  values: Partial<ComposerValues>;
};

/** The composer's text inputs, bound to its form. */
function composerInputs({ register, errors, values }: ComposerFormProps) {
  const text = (
    name: FormField,
    describedBy: string | undefined,
    invalid: boolean,
    extra: { readOnly?: boolean; registered?: UseFormRegisterReturn } = {},
  ) => (
    <input
      id={`order-${name}`}
      type="text"
      inputMode="decimal"
      autoComplete="off"
      readOnly={extra.readOnly}
      className={`${inputClasses} tabular read-only:bg-surface-muted`}
      aria-invalid={invalid}
      aria-describedby={describedBy}
      {...(extra.registered ?? register(name))}
    />
  );

  const fio2Input = (
    name: "fio2Min" | "fio2Max" | "initialFio2",
    label: string,
    hint?: ReactNode,
    readOnly = false,
  ) => (
    <Field id={`order-${name}`} label={label} hint={hint} error={errors[name]?.message}>
      {(d, invalid) => (
        <div className="flex items-center gap-2">
          {text(name, d, invalid, { readOnly })}
          <span
            className="tabular w-12 shrink-0 text-right text-sm text-ink-muted"
            aria-hidden="true"
          >
            {percentOf(values[name] ?? "")}
          </span>
        </div>
      )}
    </Field>
  );

  const unitInput = (
    name: FormField,
    label: string,
    unit: string,
    registered?: UseFormRegisterReturn,
  ) => (
    <Field id={`order-${name}`} label={`${label} (${unit})`} error={errors[name]?.message}>
      {(d, invalid) => text(name, d, invalid, registered ? { registered } : {})}
    </Field>
  );

  return { text, fio2Input, unitInput };
}

/** The device, and the FiO2, PEEP and flow limits it uses. */
export function DeviceLimitsSection({
  register,
  errors,
  values,
  chooseDevice,
  followFlow,
}: ComposerFormProps & {
  chooseDevice: (next: Device | "") => void;
  followFlow: (flowText: string) => void;
}) {
  const { fio2Input, unitInput } = composerInputs({ register, errors, values });
  const device = values.device ?? "";
  const profile = device === "" ? null : DEVICE_PROFILES[device];
  const estimated = profile?.uses.fio2 === "estimated";
  const flowRange = profile?.flow;
  const peepRange = profile?.peep;

  return (
    <Section title="Device and limits">
      <div className="grid gap-x-4 sm:grid-cols-2">
        <Field
          id="order-device"
          label="Delivery device"
          hint={
            profile
              ? `${profile.label} delivers FiO2 ${profile.fio2.min.toFixed(2)}–${profile.fio2.max.toFixed(2)}${
                  flowRange ? ` at ${flowRange.min}–${flowRange.max} L/min` : ""
                }${peepRange ? `, PEEP ${peepRange.min}–${peepRange.max} cmH2O` : ""}.`
              : "Choosing a device fills in usual limits; change any of them."
          }
          error={errors.device?.message}
        >
          {(d, invalid) => (
            <select
              id="order-device"
              className={inputClasses}
              aria-invalid={invalid}
              aria-describedby={d}
              {...register("device", {
                onChange: (e: { target: { value: string } }) =>
                  chooseDevice(e.target.value as Device | ""),
              })}
            >
              <option value="" disabled>
                Choose a device…
              </option>
              {DEVICES.map((dv) => (
                <option key={dv} value={dv}>
                  {DEVICE_PROFILES[dv].label}
                </option>
              ))}
            </select>
          )}
        </Field>
      </div>

      {profile ? (
        <div className="mt-1 space-y-1">
          <p className="text-sm font-medium">
            FiO2 (fraction, {RANGES.fio2.min.toFixed(2)}–{RANGES.fio2.max.toFixed(2)})
          </p>
          <div className="grid gap-x-4 sm:grid-cols-3">
            {fio2Input("fio2Min", "FiO2 minimum")}
            {fio2Input("fio2Max", "FiO2 maximum")}
            {fio2Input(
              "initialFio2",
              "Starting FiO2",
              estimated
                ? "Estimated from the starting flow; change the flow to change it."
                : undefined,
              estimated,
            )}
          </div>
          {profile.uses.peep ? (
            <>
              <p className="text-sm font-medium">PEEP (cmH2O)</p>
              <div className="grid gap-x-4 sm:grid-cols-3">
                {unitInput("peepMin", "PEEP minimum", "cmH2O")}
                {unitInput("peepMax", "PEEP maximum", "cmH2O")}
                {unitInput("initialPeep", "Starting PEEP", "cmH2O")}
              </div>
            </>
          ) : null}
          {profile.uses.flow ? (
            <>
              <p className="text-sm font-medium">Flow (L/min)</p>
              <div className="grid gap-x-4 sm:grid-cols-3">
                {unitInput("flowMin", "Flow minimum", "L/min")}
                {unitInput("flowMax", "Flow maximum", "L/min")}
                {unitInput(
                  "initialFlow",
                  "Starting flow",
                  "L/min",
                  register("initialFlow", {
                    onChange: (e: { target: { value: string } }) => followFlow(e.target.value),
                  }),
                )}
              </div>
            </>
          ) : null}
          {estimated ? (
            <p className="text-xs text-ink-muted">
              {profile.label}: the delivered FiO2 varies with the patient&apos;s breathing. The FiO2
              limits and the starting FiO2 are estimates from the flow (common rule of thumb), and
              the bedside record starts from that estimate.
            </p>
          ) : null}
        </div>
      ) : null}
    </Section>
  );
}

/** The SpO2 target band, and the optional PaO2 band in the user's unit. */
export function TargetBandSection({
  register,
  errors,
  values,
  pressureUnit,
}: ComposerFormProps & { pressureUnit: PressureUnit }) {
  const { unitInput } = composerInputs({ register, errors, values });

  return (
    <Section title="Target band">
      <div className="grid gap-x-6 gap-y-2 md:grid-cols-2">
        <div>
          <ChoiceGroup
            legend="SpO2 target band"
            errorId="order-bandChoice-error"
            error={errors.bandChoice?.message}
          >
            {BAND_CHOICES.map((b) => (
              <label key={b.value} className="flex items-center gap-2 text-sm">
                <input
                  type="radio"
                  value={b.value}
                  className="size-4 accent-accent"
                  {...register("bandChoice")}
                />
                <span className="tabular">{b.label}</span>
              </label>
            ))}
            <label className="flex items-center gap-2 text-sm">
              <input
                type="radio"
                value={CUSTOM}
                className="size-4 accent-accent"
                {...register("bandChoice")}
              />
              Custom
            </label>
          </ChoiceGroup>
          {values.bandChoice === CUSTOM ? (
            <div className="grid grid-cols-2 gap-x-4">
              {unitInput("spo2Lower", "SpO2 lower", "%")}
              {unitInput("spo2Upper", "SpO2 upper", "%")}
            </div>
          ) : null}
        </div>
        <fieldset className="min-w-0">
          <legend className="mb-1 text-sm font-medium">PaO2 band (optional)</legend>
          <div className="grid grid-cols-2 gap-x-4">
            {unitInput("pao2Lower", "PaO2 lower", pressureUnit)}
            {unitInput("pao2Upper", "PaO2 upper", pressureUnit)}
          </div>
          {pressureUnit === "kPa" ? (
            <p className="text-xs text-ink-muted">
              Typed in kPa; stored in mmHg (1 kPa = {MMHG_PER_KPA} mmHg).
            </p>
          ) : (
            <p className="text-xs text-ink-muted">Leave both empty for no PaO2 band.</p>
          )}
        </fieldset>
      </div>
    </Section>
  );
}

/** The step-table picker, the reassessment interval and the rationale. */
export function TitrationSection({
  register,
  errors,
  values,
  stepTables,
}: ComposerFormProps & { stepTables: StepTableChoice[] }) {
  const { unitInput } = composerInputs({ register, errors, values });
  const device = values.device ?? "";
  const profile = device === "" ? null : DEVICE_PROFILES[device];
  const fittingTables = stepTables.filter((t) => stepTableFits(t.kind, device));

  return (
    <Section title="Titration and reassessment">
      <div className="grid gap-x-4 sm:grid-cols-2">
        <Field
          id="order-stepTableId"
          label="Step table"
          hint={
            device === ""
              ? "Choose a device first."
              : fittingTables.length === 0
                ? `No step table in the library fits ${profile?.label ?? "this device"}.`
                : "Built-in published tables and your unit's own that fit this device."
          }
          error={errors.stepTableId?.message}
        >
          {(d, invalid) => (
            <select
              id="order-stepTableId"
              className={inputClasses}
              aria-invalid={invalid}
              aria-describedby={d}
              {...register("stepTableId")}
            >
              <option value="">None</option>
              {fittingTables.map((t) => (
                <option key={t.id} value={String(t.id)}>
                  {t.name}
                  {t.unitOwn ? " (unit's own)" : " (built-in)"}
                </option>
              ))}
            </select>
          )}
        </Field>
        <div>
          <ChoiceGroup
            legend="Reassess every"
            errorId="order-reassessChoice-error"
            error={errors.reassessChoice?.message}
            inline
          >
            {REASSESS_PRESETS.map((p) => (
              <label key={p.minutes} className="flex items-center gap-2 text-sm">
                <input
                  type="radio"
                  value={String(p.minutes)}
                  className="size-4 accent-accent"
                  {...register("reassessChoice")}
                />
                {p.label}
              </label>
            ))}
            <label className="flex items-center gap-2 text-sm">
              <input
                type="radio"
                value={CUSTOM}
                className="size-4 accent-accent"
                {...register("reassessChoice")}
              />
              Custom
            </label>
          </ChoiceGroup>
          {values.reassessChoice === CUSTOM
            ? unitInput("reassessCustom", "Interval", "minutes, 15–1440")
            : null}
        </div>
      </div>
      <Field
        id="order-rationale"
        label="Rationale"
        hint="Why this order: recorded in the ledger with the order."
        error={errors.rationale?.message}
      >
        {(d, invalid) => (
          <textarea
            id="order-rationale"
            rows={3}
            className={inputClasses}
            aria-invalid={invalid}
            aria-describedby={d}
            {...register("rationale")}
          />
        )}
      </Field>
    </Section>
  );
}

"use client";

import { Field, inputClasses } from "@/components/ui/Field";
import { DEVICE_PROFILES } from "@/lib/devices";
import { toNumber } from "@/lib/number-input";
import { RANGES } from "@/lib/oxygen";
import {
  isVentilatorDevice,
  tidalVolumeForTarget,
  VENT_MODE_LABELS,
  VENT_MODES_BY_DEVICE,
} from "@/lib/ventilation/settings";
import { Section, type ComposerFormProps } from "./OrderComposerFields";
import { VENT_FIELD_LABELS, type FormField } from "./order-form";

/** The patient's predicted body weight for the order, or null when no height is recorded. */
export type OrderBodyWeight = { pbwKg: number; heightCm: number; sex: "female" | "male" } | null;

/** "342 mL" for a target in mL/kg, or "—" while the field holds no usable number. */
export function mlFor(text: string | undefined, pbw: OrderBodyWeight): string {
  const n = toNumber(text ?? "");
  if (pbw === null || n === undefined || !Number.isFinite(n) || n <= 0) return "—";
  return `${tidalVolumeForTarget(n, pbw.pbwKg)}\u00a0mL`;
}

/**
 * The ventilator part of the order (invasive ventilation and NIV): mode, tidal
 * volume per kg of predicted body weight with the mL it gives this patient,
 * rate range and the lung-protective pressure limits.
 */
export function VentilationSection({
  register,
  errors,
  values,
  bodyWeight,
}: ComposerFormProps & { bodyWeight: OrderBodyWeight }) {
  const device = values.device ?? "";
  if (device === "" || !isVentilatorDevice(device)) return null;
  const modes = VENT_MODES_BY_DEVICE[device];
  const input = (name: FormField, label: string, hint?: string, aside?: string) => (
    <Field id={`order-${name}`} label={label} hint={hint} error={errors[name]?.message}>
      {(d, invalid) => (
        <div className="flex items-center gap-2">
          <input
            id={`order-${name}`}
            type="text"
            inputMode="decimal"
            autoComplete="off"
            className={`${inputClasses} tabular`}
            aria-invalid={invalid}
            aria-describedby={d}
            {...register(name)}
          />
          {aside !== undefined ? (
            <output
              htmlFor={`order-${name}`}
              className="tabular w-16 shrink-0 text-right text-sm text-ink-muted"
              data-testid={`order-${name}-ml`}
            >
              {aside}
            </output>
          ) : null}
        </div>
      )}
    </Field>
  );
  const vt = RANGES.tidalVolumeTarget;
  return (
    <Section title="Ventilation">
      <div className="space-y-1">
        <div className="grid gap-x-4 sm:grid-cols-2">
          <Field
            id="order-ventMode"
            label="Mode"
            hint={`${DEVICE_PROFILES[device].label} offers ${modes.map((m) => VENT_MODE_LABELS[m]).join(", ")}.`}
            error={errors.ventMode?.message}
          >
            {(d, invalid) => (
              <select
                id="order-ventMode"
                className={inputClasses}
                aria-invalid={invalid}
                aria-describedby={d}
                {...register("ventMode")}
              >
                <option value="" disabled>
                  Choose a mode…
                </option>
                {modes.map((m) => (
                  <option key={m} value={m}>
                    {VENT_MODE_LABELS[m]}
                  </option>
                ))}
              </select>
            )}
          </Field>
          <div className="text-sm" data-testid="order-pbw">
            <p className="font-medium">Predicted body weight</p>
            {bodyWeight ? (
              <p className="tabular">
                {bodyWeight.pbwKg.toFixed(1)} kg{" "}
                <span className="text-ink-muted">
                  ({bodyWeight.sex}, {bodyWeight.heightCm} cm; ARDS Network equation)
                </span>
              </p>
            ) : (
              <p className="font-medium text-below">
                Height not recorded: record it above. The order is refused without it; Tidemark
                never estimates it.
              </p>
            )}
          </div>
        </div>
        <p className="text-sm font-medium">
          Tidal volume (mL/kg predicted body weight, {vt.min}–{vt.max})
        </p>
        <div className="grid gap-x-4 sm:grid-cols-3">
          {input(
            "vtTarget",
            VENT_FIELD_LABELS.vtTarget,
            undefined,
            mlFor(values.vtTarget, bodyWeight),
          )}
          {input("vtMin", VENT_FIELD_LABELS.vtMin, undefined, mlFor(values.vtMin, bodyWeight))}
          {input(
            "vtMax",
            VENT_FIELD_LABELS.vtMax,
            "A check above it raises a lung-protection alert.",
            mlFor(values.vtMax, bodyWeight),
          )}
        </div>
        <p className="text-sm font-medium">
          Rate (/min, {RANGES.ventilatorRate.min}–{RANGES.ventilatorRate.max})
        </p>
        <div className="grid gap-x-4 sm:grid-cols-2">
          {input("rateMin", VENT_FIELD_LABELS.rateMin)}
          {input("rateMax", VENT_FIELD_LABELS.rateMax)}
        </div>
        <p className="text-sm font-medium">Lung-protective limits (cmH2O)</p>
        <div className="grid gap-x-4 sm:grid-cols-2">
          {input(
            "plateauLimit",
            `${VENT_FIELD_LABELS.plateauLimit} (cmH2O)`,
            "Usually 30 (ARDS Network, NEJM 2000;342:1301).",
          )}
          {input(
            "drivingLimit",
            `${VENT_FIELD_LABELS.drivingLimit} (cmH2O)`,
            "Usually 15 (common practice).",
          )}
        </div>
      </div>
    </Section>
  );
}

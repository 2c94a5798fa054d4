"use client";

import {
  useWatch,
  type FieldValues,
  type Path,
  type PathValue,
  type UseFormReturn,
} from "react-hook-form";
import { Field, inputClasses } from "@/components/ui/Field";
import { DEVICE_PROFILES, DEVICES, type Device } from "@/lib/devices";
import type { BedsideSettings } from "@/lib/chart/bedside";
import { describeDeviceFio2, DeviceOptions, flowHint, NumberField } from "./BedsideFormParts";

/** The settings a device choice fills in. */
export type DevicePrefill = { flow?: number; fio2?: number; peep?: number };

/**
 * What a device's settings start as: the applied settings when that device is
 * the one in use, else empty. PEEP only for forms that record it.
 */
export function devicePrefill(
  device: Device,
  settings: BedsideSettings | null,
  { withPeep }: { withPeep: boolean },
): DevicePrefill {
  const uses = DEVICE_PROFILES[device].uses;
  if (!settings || settings.device !== device) return {};
  return {
    ...(uses.flow && settings.flow !== null ? { flow: settings.flow } : {}),
    ...(uses.fio2 === "set" ? { fio2: settings.fio2 } : {}),
    ...(withPeep && uses.peep && settings.peep !== null ? { peep: settings.peep } : {}),
  };
}

/** The form's own names for the settings; PEEP only where the form records it. */
export type DeviceSettingsNames<T extends FieldValues> = {
  device: Path<T>;
  flow: Path<T>;
  fio2: Path<T>;
  peep?: Path<T>;
};

/**
 * The "device in use" fieldset of the reading and blood-gas forms: the device
 * (choosing another refills flow, FiO2 and PEEP from the applied settings), the
 * flow where the device takes one, the FiO2 typed where it is set or shown as
 * the estimate or room air, and the PEEP where the device has one and the form
 * records it. Each field's id is `${id}-` and the form's name for it.
 */
export function DeviceSettingsFields<T extends FieldValues>({
  id,
  legend,
  names,
  form,
  settings,
  initialDevice,
  estimateNote,
  deviceClassName = "col-span-2",
}: {
  /** The form's useId prefix. */
  id: string;
  legend: string;
  names: DeviceSettingsNames<T>;
  form: Pick<UseFormReturn<T>, "register" | "control" | "setValue" | "getFieldState" | "formState">;
  settings: BedsideSettings | null;
  initialDevice: Device;
  /** How an estimated FiO2 is kept, in a sentence. */
  estimateNote: string;
  deviceClassName?: string;
}) {
  const { register, control, setValue, getFieldState, formState } = form;
  const withPeep = names.peep !== undefined;
  const [typedDevice, typedFlow] = useWatch({ control, name: [names.device, names.flow] });
  const device: Device = DEVICES.find((d) => d === typedDevice) ?? initialDevice;
  const uses = DEVICE_PROFILES[device].uses;
  // Shown by the server-rendered page too, before the form takes over.
  const initial = devicePrefill(initialDevice, settings, { withPeep });
  const errorOf = (name: Path<T>) => getFieldState(name, formState).error?.message;
  // The names are the caller's; each holds a number, or nothing when left empty.
  const fill = (name: Path<T> | undefined, value: number | undefined) => {
    if (name !== undefined) setValue(name, value as PathValue<T, Path<T>>);
  };
  const deviceId = `${id}-${names.device}`;

  return (
    <fieldset className="grid grid-cols-2 gap-x-3 sm:grid-cols-4">
      <legend className="mb-1 text-sm font-semibold">{legend}</legend>
      <div className={deviceClassName}>
        <Field
          id={deviceId}
          label="Device"
          hint={settings ? `Applied now: ${DEVICE_PROFILES[settings.device].label}.` : undefined}
          error={errorOf(names.device)}
        >
          {(d, invalid) => (
            <select
              id={deviceId}
              className={inputClasses}
              aria-invalid={invalid}
              aria-describedby={d}
              defaultValue={initialDevice}
              {...register(names.device, {
                onChange: (e: { target: { value: string } }) => {
                  const next = DEVICES.find((x) => x === e.target.value);
                  if (!next) return;
                  const values = devicePrefill(next, settings, { withPeep });
                  fill(names.flow, values.flow);
                  fill(names.fio2, values.fio2);
                  fill(names.peep, values.peep);
                },
              })}
            >
              <DeviceOptions />
            </select>
          )}
        </Field>
      </div>
      {uses.flow ? (
        <NumberField
          form={form}
          id={id}
          name={names.flow}
          label="Flow (L/min)"
          hint={flowHint(device)}
          defaultValue={initial.flow}
        />
      ) : null}
      {uses.fio2 === "set" ? (
        <NumberField
          form={form}
          id={id}
          name={names.fio2}
          label="FiO2"
          hint="A fraction: 0.40 for 40 %."
          defaultValue={initial.fio2}
        />
      ) : (
        <div>
          <p className="text-sm font-medium">
            {uses.fio2 === "estimated" ? "FiO2 (estimated)" : "FiO2"}
          </p>
          <p
            className="tabular mt-1 rounded-md border border-dashed border-border-strong px-2.5 py-1.5 text-base"
            data-testid="estimated-fio2"
          >
            {describeDeviceFio2(device, typeof typedFlow === "number" ? typedFlow : undefined)}
          </p>
          <p className="text-xs text-ink-muted">
            {uses.fio2 === "estimated" ? estimateNote : "Room air is FiO2 0.21."}
          </p>
          <p className="min-h-4 text-xs font-medium text-below" aria-live="polite">
            {errorOf(names.fio2) ?? ""}
          </p>
        </div>
      )}
      {names.peep !== undefined && uses.peep ? (
        <NumberField
          form={form}
          id={id}
          name={names.peep}
          label="PEEP (cmH2O)"
          defaultValue={initial.peep}
        />
      ) : null}
    </fieldset>
  );
}

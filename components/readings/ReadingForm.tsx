"use client";

import { zodResolver } from "@hookform/resolvers/zod";
import Link from "next/link";
import { useRouter } from "next/navigation";
import { useId, useMemo, useState } from "react";
import { useForm, useWatch, type Resolver } from "react-hook-form";
import type { z } from "zod";
import { chartReadingAction } from "@/app/(app)/patients/[patientId]/actions";
import { spo2Status } from "@/components/adjustments/BedsideContextCards";
import { Button, buttonClasses } from "@/components/ui/Button";
import { Field, inputClasses } from "@/components/ui/Field";
import { StatusBadge } from "@/components/ui/StatusBadge";
import { DEVICE_PROFILES, DEVICES, type Device } from "@/lib/orders/devices";
import type { BedsideContext } from "@/lib/patients/bedside";
import { readingSchema } from "@/lib/readings/schema";
import {
  describeDeviceFio2,
  DeviceOptions,
  estimateFromFlow,
  flowHint,
  formatFio2Value,
  type FormNotice,
  FormStatus,
  fromZonedLocalInput,
  localDateTimeSchema,
  placeServerErrors,
  textDefault,
  timeZoneNote,
  toNumber,
  toZonedLocalInput,
  useHydrated,
  useIdempotencyKey,
} from "./BedsideFormParts";

/**
 * The reading form's schema: the shared readingSchema's fields and messages,
 * with flow or FiO2 required as the chosen device uses them, and the time in
 * the unit's wall clock.
 */
export const readingFormSchema = readingSchema
  .pick({
    spo2: true,
    respiratoryRate: true,
    pulseRate: true,
    device: true,
    flow: true,
    fio2: true,
  })
  .extend({ takenAt: localDateTimeSchema("Time taken") })
  .superRefine(
    (raw, ctx) => {
      // Runs even when other fields failed, so every field shows its error at once.
      const v = raw as { device?: unknown; flow?: unknown; fio2?: unknown };
      const device = DEVICES.find((d) => d === v.device);
      if (!device) return;
      const profile = DEVICE_PROFILES[device];
      if (profile.uses.flow && v.flow === undefined) {
        ctx.addIssue({
          code: "custom",
          path: ["flow"],
          message: `Flow is required for ${profile.label}.`,
        });
      }
      if (profile.uses.fio2 === "set" && v.fio2 === undefined) {
        ctx.addIssue({
          code: "custom",
          path: ["fio2"],
          message: `FiO2 is required for ${profile.label}.`,
        });
      }
    },
    { when: () => true },
  );
type FormInput = z.input<typeof readingFormSchema>;
type FormOutput = z.output<typeof readingFormSchema>;
type FieldName = "spo2" | "respiratoryRate" | "pulseRate" | "device" | "flow" | "fio2" | "takenAt";
const FIELDS: readonly FieldName[] = [
  "spo2",
  "respiratoryRate",
  "pulseRate",
  "device",
  "flow",
  "fio2",
  "takenAt",
];

const asNumber = (v: unknown): number | undefined => (typeof v === "number" ? v : undefined);

/** What the device's settings start as: the applied settings when the device is the one in use. */
function prefill(device: Device, context: BedsideContext): { flow?: number; fio2?: number } {
  const { settings } = context;
  const uses = DEVICE_PROFILES[device].uses;
  if (!settings || settings.device !== device) return {};
  return {
    ...(uses.flow && settings.flow !== null ? { flow: settings.flow } : {}),
    ...(uses.fio2 === "set" ? { fio2: settings.fio2 } : {}),
  };
}

/**
 * Chart one reading: SpO2, respiratory and pulse rate, the device and the
 * oxygen in use (prefilled from the applied settings), and the time taken.
 */
export function ReadingForm({
  patientId,
  context,
  timeZone,
}: {
  patientId: number;
  context: BedsideContext;
  timeZone: string;
}) {
  const id = useId();
  const router = useRouter();
  const idempotencyKey = useIdempotencyKey();
  const hydrated = useHydrated();
  const [notice, setNotice] = useState<FormNotice | null>(null);
  const [saved, setSaved] = useState(false);
  const initialDevice: Device = context.settings?.device ?? context.order?.device ?? "room_air";
  const resolver = useMemo<Resolver<FormInput, unknown, FormOutput>>(
    () => zodResolver(readingFormSchema),
    [],
  );
  const {
    register,
    control,
    handleSubmit,
    setError,
    setValue,
    formState: { errors, isSubmitting },
  } = useForm<FormInput, unknown, FormOutput>({
    resolver,
    defaultValues: {
      device: initialDevice,
      ...prefill(initialDevice, context),
      takenAt: toZonedLocalInput(new Date(), timeZone),
    },
  });
  // Shown by the server-rendered page too, before the form takes over.
  const initial: Partial<Record<string, number>> = prefill(initialDevice, context);
  const [device, typedFlow, typedSpo2, typedFio2] = useWatch({
    control,
    name: ["device", "flow", "spo2", "fio2"],
  });
  const chosen: Device = DEVICES.find((d) => d === device) ?? initialDevice;
  const profile = DEVICE_PROFILES[chosen];
  const spo2 = asNumber(typedSpo2);
  const fio2ForBand =
    profile.uses.fio2 === "set"
      ? asNumber(typedFio2)
      : profile.uses.fio2 === "fixed"
        ? 0.21
        : (estimateFromFlow(chosen, asNumber(typedFlow)) ?? undefined);

  const onSubmit = handleSubmit(async (values) => {
    setNotice(null);
    const takenAt = fromZonedLocalInput(values.takenAt, timeZone);
    if (!takenAt) {
      setError("takenAt", { type: "client", message: "Time taken must be a date and time." });
      return;
    }
    const uses = DEVICE_PROFILES[values.device].uses;
    let result: Awaited<ReturnType<typeof chartReadingAction>>;
    try {
      result = await chartReadingAction({
        patientId,
        takenAt: takenAt.toISOString(),
        spo2: values.spo2,
        respiratoryRate: values.respiratoryRate,
        pulseRate: values.pulseRate,
        device: values.device,
        ...(uses.flow ? { flow: values.flow } : {}),
        ...(uses.fio2 === "set" ? { fio2: values.fio2 } : {}),
        idempotencyKey,
      });
    } catch {
      setNotice({
        kind: "error",
        text: "Tidemark could not be reached; nothing was charted. Check the connection and try again — your values are kept.",
      });
      return;
    }
    if (!result.ok) {
      if (result.status === 401) {
        setNotice({
          kind: "error",
          text: "Your session has ended. Sign in again in another tab, then chart the reading; your values are kept here.",
        });
        return;
      }
      const unplaced = placeServerErrors(
        result.fieldErrors,
        (path) => FIELDS.find((f) => f === path),
        setError,
      );
      setNotice({
        kind: "error",
        text:
          Object.keys(result.fieldErrors ?? {}).length > unplaced.length
            ? `${result.message} See the message beside each field; nothing you typed was lost.`
            : result.message,
        details: unplaced,
      });
      return;
    }
    setSaved(true);
    setNotice({
      kind: "success",
      text: `Reading charted: SpO2 ${result.data.spo2} % on FiO2 ${formatFio2Value(result.data.fio2)}${result.data.fio2Estimated ? " (estimated)" : ""}. Opening the Chart…`,
    });
    router.push(`/patients/${patientId}`);
  });

  const numberInput = (
    name: "spo2" | "respiratoryRate" | "pulseRate" | "flow" | "fio2",
    describedBy: string | undefined,
    invalid: boolean,
    mode: "decimal" | "numeric" = "decimal",
  ) => (
    <input
      id={`${id}-${name}`}
      type="text"
      inputMode={mode}
      autoComplete="off"
      className={`${inputClasses} tabular`}
      aria-invalid={invalid}
      aria-describedby={describedBy}
      defaultValue={textDefault(initial[name])}
      {...register(name, { setValueAs: toNumber })}
    />
  );

  return (
    <form
      onSubmit={onSubmit}
      noValidate
      aria-label="Chart reading"
      data-ready={hydrated ? "true" : undefined}
      className="rounded-card border border-border bg-surface p-4 shadow-card"
    >
      <fieldset disabled={!hydrated} className="min-w-0 space-y-4">
        {context.order ? (
          <p className="text-sm text-ink-muted" data-testid="reading-order">
            Order in effect: {DEVICE_PROFILES[context.order.device].label}, SpO2 band{" "}
            <span className="tabular">
              {context.order.spo2Band.lower}–{context.order.spo2Band.upper} %
            </span>
            .
          </p>
        ) : (
          <p className="text-sm text-ink-muted">
            No oxygen order in effect; the reading is charted all the same.
          </p>
        )}
        <fieldset className="grid grid-cols-2 gap-x-3 sm:grid-cols-4">
          <legend className="mb-1 text-sm font-semibold">Observation</legend>
          <div>
            <Field id={`${id}-spo2`} label="SpO2 (%)" error={errors.spo2?.message}>
              {(d, invalid) => numberInput("spo2", d, invalid)}
            </Field>
            {context.order &&
            spo2 !== undefined &&
            Number.isFinite(spo2) &&
            spo2 >= 50 &&
            spo2 <= 100 ? (
              <span data-testid="spo2-band">
                <StatusBadge
                  status={spo2Status(spo2, context.order.spo2Band, fio2ForBand ?? 0.21)}
                />
              </span>
            ) : null}
          </div>
          <Field
            id={`${id}-respiratoryRate`}
            label="Respiratory rate (/min)"
            error={errors.respiratoryRate?.message}
          >
            {(d, invalid) => numberInput("respiratoryRate", d, invalid, "numeric")}
          </Field>
          <Field
            id={`${id}-pulseRate`}
            label="Pulse rate (/min)"
            hint="Optional"
            error={errors.pulseRate?.message}
          >
            {(d, invalid) => numberInput("pulseRate", d, invalid, "numeric")}
          </Field>
          <Field
            id={`${id}-takenAt`}
            label="Time taken"
            hint={timeZoneNote(timeZone)}
            error={errors.takenAt?.message}
          >
            {(d, invalid) => (
              <input
                id={`${id}-takenAt`}
                type="datetime-local"
                className={`${inputClasses} tabular`}
                aria-invalid={invalid}
                aria-describedby={d}
                {...register("takenAt")}
              />
            )}
          </Field>
        </fieldset>

        <fieldset className="grid grid-cols-2 gap-x-3 sm:grid-cols-4">
          <legend className="mb-1 text-sm font-semibold">Oxygen in use</legend>
          <div className="col-span-2">
            <Field
              id={`${id}-device`}
              label="Device"
              hint={
                context.settings
                  ? `Applied now: ${DEVICE_PROFILES[context.settings.device].label}.`
                  : undefined
              }
              error={errors.device?.message}
            >
              {(d, invalid) => (
                <select
                  id={`${id}-device`}
                  className={inputClasses}
                  aria-invalid={invalid}
                  aria-describedby={d}
                  defaultValue={initialDevice}
                  {...register("device", {
                    onChange: (e: { target: { value: string } }) => {
                      const next = DEVICES.find((x) => x === e.target.value);
                      if (!next) return;
                      const values = prefill(next, context);
                      setValue("flow", values.flow);
                      setValue("fio2", values.fio2);
                    },
                  })}
                >
                  <DeviceOptions />
                </select>
              )}
            </Field>
          </div>
          {profile.uses.flow ? (
            <Field
              id={`${id}-flow`}
              label="Flow (L/min)"
              hint={flowHint(chosen)}
              error={errors.flow?.message}
            >
              {(d, invalid) => numberInput("flow", d, invalid)}
            </Field>
          ) : null}
          {profile.uses.fio2 === "set" ? (
            <Field
              id={`${id}-fio2`}
              label="FiO2"
              hint="A fraction: 0.40 for 40 %."
              error={errors.fio2?.message}
            >
              {(d, invalid) => numberInput("fio2", d, invalid)}
            </Field>
          ) : (
            <div>
              <p className="text-sm font-medium">
                {profile.uses.fio2 === "estimated" ? "FiO2 (estimated)" : "FiO2"}
              </p>
              <p
                className="tabular mt-1 rounded-md border border-dashed border-border-strong px-2.5 py-1.5 text-base"
                data-testid="estimated-fio2"
              >
                {describeDeviceFio2(chosen, asNumber(typedFlow))}
              </p>
              <p className="text-xs text-ink-muted">
                {profile.uses.fio2 === "estimated"
                  ? "Charted as an estimate from the flow."
                  : "Room air is FiO2 0.21."}
              </p>
              <p className="min-h-4 text-xs font-medium text-below" aria-live="polite">
                {errors.fio2?.message ?? ""}
              </p>
            </div>
          )}
        </fieldset>

        <div className="flex flex-wrap items-center gap-3">
          <Button type="submit" disabled={isSubmitting || saved}>
            {isSubmitting ? "Charting…" : saved ? "Charted" : "Chart reading"}
          </Button>
          <Link href={`/patients/${patientId}`} className={buttonClasses("ghost")}>
            Cancel
          </Link>
        </div>
        <FormStatus notice={notice} />
      </fieldset>
    </form>
  );
}

"use client";

import { zodResolver } from "@hookform/resolvers/zod";
import Link from "next/link";
import { useRouter } from "next/navigation";
import { useId, useMemo, useState } from "react";
import { useForm, useWatch, type Resolver } from "react-hook-form";
import type { z } from "zod";
import { chartReadingAction } from "@/lib/readings/actions";
import { spo2Status } from "@/components/adjustments/BedsideContextCards";
import {
  formatFio2Value,
  type FormNotice,
  FormStatus,
  fromZonedLocalInput,
  localDateTimeSchema,
  NumberField,
  refusalNotice,
  toZonedLocalInput,
  UnitTimeField,
  useHydrated,
  useIdempotencyKey,
} from "@/components/bedside/BedsideFormParts";
import { DeviceSettingsFields, devicePrefill } from "@/components/bedside/DeviceSettingsFields";
import { Button, buttonClasses } from "@/components/ui/Button";
import { StatusBadge } from "@/components/ui/StatusBadge";
import { DEVICE_PROFILES, DEVICES, estimateFio2, type Device } from "@/lib/devices";
import type { BedsideContext } from "@/lib/chart/bedside";
import {
  BELOW_OXIMETER_ACCURACY_LABEL,
  belowOximeterAccuracy,
  OXIMETER_ACCURACY_NOTE,
} from "@/lib/oxygen/oximetry";
import { RANGES } from "@/lib/oxygen/ranges";
import { readingSchema } from "@/lib/readings/schema";

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
  const form = useForm<FormInput, unknown, FormOutput>({
    resolver,
    defaultValues: {
      device: initialDevice,
      ...devicePrefill(initialDevice, context.settings, { withPeep: false }),
      takenAt: toZonedLocalInput(new Date(), timeZone),
    },
  });
  const {
    control,
    handleSubmit,
    setError,
    formState: { isSubmitting },
  } = form;
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
        : (estimateFio2(chosen, asNumber(typedFlow)) ?? undefined);

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
      setNotice(
        refusalNotice(result, FIELDS, setError, {
          sessionEnded:
            "Your session has ended. Sign in again in another tab, then chart the reading; your values are kept here.",
        }),
      );
      return;
    }
    setSaved(true);
    setNotice({
      kind: "success",
      text: `Reading charted: SpO2 ${result.data.spo2} % on FiO2 ${formatFio2Value(result.data.fio2)}${result.data.fio2Estimated ? " (estimated)" : ""}. Opening the Chart…`,
    });
    router.push(`/patients/${patientId}`);
  });

  return (
    <form
      onSubmit={onSubmit}
      noValidate
      aria-label="Chart SpO2"
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
            <NumberField form={form} id={id} name="spo2" label="SpO2 (%)" />
            {spo2 !== undefined &&
            Number.isFinite(spo2) &&
            spo2 >= RANGES.spo2.min &&
            spo2 <= RANGES.spo2.max ? (
              <span className="flex flex-wrap items-center gap-1">
                {context.order ? (
                  <span data-testid="spo2-band">
                    <StatusBadge
                      status={spo2Status(spo2, context.order.spo2Band, {
                        fio2: fio2ForBand ?? 0.21,
                        flow: profile.uses.flow ? (asNumber(typedFlow) ?? null) : null,
                      })}
                    />
                  </span>
                ) : null}
                {belowOximeterAccuracy(spo2) ? (
                  <span className="text-xs text-ink-muted" title={OXIMETER_ACCURACY_NOTE}>
                    {BELOW_OXIMETER_ACCURACY_LABEL}: charted and alerted; confirm with a blood gas.
                  </span>
                ) : null}
              </span>
            ) : null}
          </div>
          <NumberField
            form={form}
            id={id}
            name="respiratoryRate"
            label="Respiratory rate (/min)"
            inputMode="numeric"
          />
          <NumberField
            form={form}
            id={id}
            name="pulseRate"
            label="Pulse rate (/min)"
            hint="Optional"
            inputMode="numeric"
          />
          <UnitTimeField
            form={form}
            id={id}
            name="takenAt"
            label="Time taken"
            timeZone={timeZone}
          />
        </fieldset>

        <DeviceSettingsFields
          id={id}
          legend="Oxygen in use"
          names={{ device: "device", flow: "flow", fio2: "fio2" }}
          form={form}
          settings={context.settings}
          initialDevice={initialDevice}
          estimateNote="Charted as an estimate from the flow."
        />

        <div className="flex flex-wrap items-center gap-3">
          <Button type="submit" disabled={isSubmitting || saved}>
            {isSubmitting ? "Charting…" : saved ? "Charted" : "Chart SpO2"}
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

"use client";

import { zodResolver } from "@hookform/resolvers/zod";
import Link from "next/link";
import { useId, useMemo, useState } from "react";
import { useForm, useWatch, type Resolver } from "react-hook-form";
import { z } from "zod";
import { recordBloodGasAction } from "@/lib/blood-gases/actions";
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
import { SelectField } from "@/components/ui/SelectField";
import type { BloodGasInput as BloodGasPayload } from "@/lib/blood-gases/schema";
import { otherPressureUnit } from "@/lib/blood-gases/pressure-hint";
import { bloodGasSchema, saturationIssue } from "@/lib/blood-gases/schema";
import type { BloodGasView } from "@/lib/blood-gases/service";
import { emptyToUndefined } from "@/lib/number-input";
import {
  type BloodGasInput as EngineInput,
  type PressureUnit,
  toGramsPerDecilitre,
  toMmHg,
} from "@/lib/oxygen";
import {
  HEMOGLOBIN_UNITS,
  hemoglobinRangeIn,
  PRESSURE_UNITS,
  pressureRangeIn,
  rangeMessage,
} from "@/lib/oxygenation/schema";
import { DEVICE_PROFILES, DEVICES, RESPIRATORY_SUPPORT, type Device } from "@/lib/devices";
import type { BedsideContext } from "@/lib/chart/bedside";
import { BloodGasResult } from "./BloodGasResult";

const shared = bloodGasSchema.shape;

const typedNumber = (label: string) =>
  z.number({
    error: (issue) =>
      issue.input === undefined ? `Enter ${label}.` : `${label} must be a number.`,
  });

/**
 * The blood-gas form's schema: the shared bloodGasSchema's fields and messages
 * for everything kept in its own unit; PaO2, PaCO2 and haemoglobin checked
 * against the same ranges re-stated in the unit typed (kPa, g/L, mmol/L), so a
 * refusal speaks the unit the person used; flow, FiO2 and PEEP required as the
 * device uses them.
 */
export const bloodGasFormSchema = z
  .object({
    sampleType: shared.sampleType,
    sampledAt: localDateTimeSchema("Time sampled"),
    pressureUnit: z.enum(PRESSURE_UNITS, { error: "Pressure unit must be mmHg or kPa." }),
    hemoglobinUnit: z.enum(HEMOGLOBIN_UNITS, {
      error: "Haemoglobin unit must be g/dL, g/L or mmol/L.",
    }),
    ph: shared.ph,
    pao2: typedNumber("PaO2"),
    paco2: typedNumber("PaCO2"),
    hco3: shared.hco3,
    baseExcess: shared.baseExcess,
    sao2: shared.sao2,
    hemoglobin: z.preprocess(emptyToUndefined, typedNumber("Haemoglobin").optional()),
    device: shared.device,
    flow: shared.flow,
    fio2: shared.fio2,
    peep: shared.peep,
  })
  .superRefine(
    (raw, ctx) => {
      // Runs even when other fields failed, so every field shows its error at once.
      const v = raw as Record<string, unknown>;
      const issue = (path: string, message: string) =>
        ctx.addIssue({ code: "custom", path: [path], message });
      const inRange = (
        field: string,
        label: string,
        range: { min: number; max: number; unit: string },
      ) => {
        const value = v[field];
        if (typeof value !== "number" || !Number.isFinite(value)) return;
        if (value < range.min || value > range.max)
          issue(field, rangeMessage(label, range.min, range.max, range.unit));
      };
      const pressure = PRESSURE_UNITS.find((u) => u === v.pressureUnit);
      if (pressure) {
        inRange("pao2", "PaO2", pressureRangeIn("pao2", pressure));
        inRange("paco2", "PaCO2", pressureRangeIn("paco2", pressure));
      }
      const hb = HEMOGLOBIN_UNITS.find((u) => u === v.hemoglobinUnit);
      if (hb) inRange("hemoglobin", "Haemoglobin", hemoglobinRangeIn(hb));
      const saturation = saturationIssue(v.sampleType, v.sao2);
      if (saturation) issue("sao2", saturation);
      const device = DEVICES.find((d) => d === v.device);
      if (!device) return;
      const profile = DEVICE_PROFILES[device];
      if (profile.uses.flow && v.flow === undefined)
        issue("flow", `Flow is required for ${profile.label}.`);
      if (profile.uses.fio2 === "set" && v.fio2 === undefined)
        issue("fio2", `FiO2 is required for ${profile.label}.`);
    },
    { when: () => true },
  );
export type BloodGasFormInput = z.input<typeof bloodGasFormSchema>;
export type BloodGasFormOutput = z.output<typeof bloodGasFormSchema>;

type FieldName =
  | "sampleType"
  | "sampledAt"
  | "ph"
  | "pao2"
  | "paco2"
  | "hco3"
  | "baseExcess"
  | "sao2"
  | "hemoglobin"
  | "device"
  | "flow"
  | "fio2"
  | "peep";
const FIELDS: readonly FieldName[] = [
  "sampleType",
  "sampledAt",
  "ph",
  "pao2",
  "paco2",
  "hco3",
  "baseExcess",
  "sao2",
  "hemoglobin",
  "device",
  "flow",
  "fio2",
  "peep",
];

// Stored to 0.1 mmHg and 0.1 g/dL: rounding before sending keeps the stored
// values and the indices computed from them the same numbers.
const round1 = (v: number) => Math.round(v * 10) / 10;

/**
 * What the server takes (mmHg, g/dL, the settings the device uses) from what
 * the form holds (the unit typed). The time is already an instant.
 */
export function bloodGasPayload(
  values: BloodGasFormOutput,
  extra: { patientId: number; sampledAt: Date; idempotencyKey: string },
): BloodGasPayload {
  const uses = DEVICE_PROFILES[values.device].uses;
  return {
    patientId: extra.patientId,
    sampledAt: extra.sampledAt.toISOString(),
    sampleType: values.sampleType,
    ph: values.ph,
    pao2: round1(toMmHg(values.pao2, values.pressureUnit)),
    paco2: round1(toMmHg(values.paco2, values.pressureUnit)),
    hco3: values.hco3,
    baseExcess: values.baseExcess,
    sao2: values.sao2,
    hemoglobin:
      values.hemoglobin === undefined
        ? undefined
        : round1(toGramsPerDecilitre(values.hemoglobin, values.hemoglobinUnit)),
    device: values.device,
    ...(uses.flow ? { flow: values.flow } : {}),
    ...(uses.fio2 === "set" ? { fio2: values.fio2 } : {}),
    ...(uses.peep ? { peep: values.peep } : {}),
    idempotencyKey: extra.idempotencyKey,
  };
}

/** The engine input the stored indices were computed from, for the oxygenation panel. */
export function engineInputOf(view: BloodGasView, sent: BloodGasPayload): EngineInput {
  return {
    fio2: view.fio2,
    pao2: view.pao2,
    paco2: view.paco2,
    barometricPressure: view.barometricPressure,
    support: RESPIRATORY_SUPPORT[view.device],
    ...(typeof sent.hemoglobin === "number" ? { hemoglobin: sent.hemoglobin } : {}),
    ...(typeof sent.sao2 === "number" ? { sao2: sent.sao2 / 100 } : {}),
    ...(view.peep !== null ? { peep: view.peep } : {}),
    ...(view.device === "hfnc" && typeof sent.flow === "number" ? { flow: sent.flow } : {}),
  };
}

type Saved = { view: BloodGasView; sent: BloodGasPayload };

/**
 * Enter one blood gas. After saving, an arterial gas shows its stored indices
 * in the oxygenation panel at once; "Enter another blood gas" starts afresh.
 */
export function BloodGasForm(props: {
  patientId: number;
  context: BedsideContext;
  pressureUnit: PressureUnit;
  timeZone: string;
}) {
  const [round, setRound] = useState(0);
  const [saved, setSaved] = useState<Saved | null>(null);
  if (saved) {
    return (
      <BloodGasResult
        view={saved.view}
        input={engineInputOf(saved.view, saved.sent)}
        patientId={props.patientId}
        pressureUnit={props.pressureUnit}
        timeZone={props.timeZone}
        onAnother={() => {
          setSaved(null);
          setRound((r) => r + 1);
        }}
      />
    );
  }
  return <BloodGasEntry key={round} {...props} onSaved={setSaved} />;
}

function BloodGasEntry({
  patientId,
  context,
  pressureUnit,
  timeZone,
  onSaved,
}: {
  patientId: number;
  context: BedsideContext;
  pressureUnit: PressureUnit;
  timeZone: string;
  onSaved: (saved: Saved) => void;
}) {
  const id = useId();
  const idempotencyKey = useIdempotencyKey();
  const hydrated = useHydrated();
  const [notice, setNotice] = useState<FormNotice | null>(null);
  const initialDevice: Device = context.settings?.device ?? context.order?.device ?? "room_air";
  const resolver = useMemo<Resolver<BloodGasFormInput, unknown, BloodGasFormOutput>>(
    () => zodResolver(bloodGasFormSchema),
    [],
  );
  const form = useForm<BloodGasFormInput, unknown, BloodGasFormOutput>({
    resolver,
    defaultValues: {
      sampleType: "arterial",
      sampledAt: toZonedLocalInput(new Date(), timeZone),
      pressureUnit,
      hemoglobinUnit: "g/dL",
      device: initialDevice,
      ...devicePrefill(initialDevice, context.settings, { withPeep: true }),
    },
  });
  const {
    register,
    control,
    handleSubmit,
    setError,
    formState: { errors, isSubmitting },
  } = form;
  const [typedUnit, sampleType, typedHbUnit, typedPao2, typedPaco2] = useWatch({
    control,
    name: ["pressureUnit", "sampleType", "hemoglobinUnit", "pao2", "paco2"],
  });
  const unit: PressureUnit = PRESSURE_UNITS.find((u) => u === typedUnit) ?? pressureUnit;
  const venous = sampleType === "venous";
  const po2 = venous ? "PvO2" : "PaO2";
  const pco2 = venous ? "PvCO2" : "PaCO2";
  // A pressure that looks like the other unit is pointed out, never converted.
  const unitHint = (field: "pao2" | "paco2", label: string, value: unknown) => {
    const other = typeof value === "number" ? otherPressureUnit(field, value, unit) : undefined;
    return other
      ? `${label} ${value as number} looks like ${other}, not ${unit}: set "Pressures in" to ${other}, or check the value.`
      : null;
  };
  const pressureHints = [
    unitHint("pao2", po2, typedPao2),
    unitHint("paco2", pco2, typedPaco2),
  ].filter((h): h is string => h !== null);

  const onSubmit = handleSubmit(async (values) => {
    setNotice(null);
    const sampledAt = fromZonedLocalInput(values.sampledAt, timeZone);
    if (!sampledAt) {
      setError("sampledAt", { type: "client", message: "Time sampled must be a date and time." });
      return;
    }
    const sent = bloodGasPayload(values, { patientId, sampledAt, idempotencyKey });
    let result: Awaited<ReturnType<typeof recordBloodGasAction>>;
    try {
      result = await recordBloodGasAction(sent);
    } catch {
      setNotice({
        kind: "error",
        text: "Tidemark could not be reached; nothing was saved. Check the connection and try again — your values are kept.",
      });
      return;
    }
    if (!result.ok) {
      setNotice(
        refusalNotice(result, FIELDS, setError, {
          sessionEnded:
            "Your session has ended. Sign in again in another tab, then save; your values are kept here.",
          besideFields:
            "See the message beside each field (the server states pressures in mmHg and haemoglobin in g/dL); nothing you typed was lost.",
        }),
      );
      return;
    }
    onSaved({ view: result.data, sent });
  });

  const hbRange = hemoglobinRangeIn(HEMOGLOBIN_UNITS.find((u) => u === typedHbUnit) ?? "g/dL");

  return (
    <form
      onSubmit={onSubmit}
      noValidate
      aria-label="Enter blood gas"
      data-ready={hydrated ? "true" : undefined}
      className="rounded-card border border-border bg-surface p-4 shadow-card"
    >
      <fieldset disabled={!hydrated} className="min-w-0 space-y-4">
        <div className="grid grid-cols-2 gap-x-3 sm:grid-cols-4">
          <fieldset
            className="col-span-2"
            aria-describedby={errors.sampleType ? `${id}-sampleType-error` : undefined}
          >
            <legend className="text-sm font-medium">Sample type</legend>
            <div className="mt-1 flex flex-wrap gap-4 py-1.5">
              <label className="flex items-center gap-2 text-sm">
                <input
                  type="radio"
                  value="arterial"
                  defaultChecked
                  className="size-4 accent-accent"
                  {...register("sampleType")}
                />
                Arterial (ABG)
              </label>
              <label className="flex items-center gap-2 text-sm">
                <input
                  type="radio"
                  value="venous"
                  className="size-4 accent-accent"
                  {...register("sampleType")}
                />
                Venous (VBG)
              </label>
            </div>
            <p
              id={`${id}-sampleType-error`}
              className="min-h-4 text-xs font-medium text-below"
              aria-live="polite"
            >
              {errors.sampleType?.message ?? ""}
            </p>
          </fieldset>
          <UnitTimeField
            form={form}
            id={id}
            name="sampledAt"
            label="Time sampled"
            timeZone={timeZone}
          />
          <SelectField
            form={form}
            id={id}
            name="pressureUnit"
            label="Pressures in"
            options={PRESSURE_UNITS}
            defaultValue={pressureUnit}
          />
        </div>

        <fieldset className="grid grid-cols-2 gap-x-3 sm:grid-cols-4">
          <legend className="mb-1 text-sm font-semibold">Result</legend>
          <NumberField form={form} id={id} name="ph" label="pH" hint="Optional" />
          <NumberField
            form={form}
            id={id}
            name="pao2"
            label={`${po2} (${unit})`}
            describedBy={pressureHints.length ? `${id}-unit-hint` : undefined}
          />
          <NumberField
            form={form}
            id={id}
            name="paco2"
            label={`${pco2} (${unit})`}
            describedBy={pressureHints.length ? `${id}-unit-hint` : undefined}
          />
          {pressureHints.length > 0 && (
            <p
              id={`${id}-unit-hint`}
              role="status"
              className="col-span-2 text-sm text-overdue sm:col-span-4"
              data-testid="pressure-unit-hint"
            >
              {pressureHints.join(" ")}
            </p>
          )}
          <NumberField form={form} id={id} name="hco3" label="HCO3 (mmol/L)" hint="Optional" />
          <NumberField
            form={form}
            id={id}
            name="baseExcess"
            label="Base excess (mmol/L)"
            hint="Optional"
          />
          <NumberField
            form={form}
            id={id}
            name="sao2"
            label={venous ? "SvO2/ScvO2 (%)" : "SaO2 (%)"}
            hint="Co-oximetry; optional"
          />
          <NumberField
            form={form}
            id={id}
            name="hemoglobin"
            label="Haemoglobin"
            hint={`Optional; ${hbRange.min}–${hbRange.max} ${hbRange.unit}`}
          />
          <SelectField
            form={form}
            id={id}
            name="hemoglobinUnit"
            label="Haemoglobin unit"
            options={HEMOGLOBIN_UNITS}
          />
        </fieldset>

        <DeviceSettingsFields
          id={id}
          legend="Support at sampling"
          names={{ device: "device", flow: "flow", fio2: "fio2", peep: "peep" }}
          form={form}
          settings={context.settings}
          initialDevice={initialDevice}
          estimateNote="Stored as an estimate from the flow; indices inherit its uncertainty."
          deviceClassName="col-span-2 sm:col-span-1"
        />
        {context.settings ? (
          <p className="text-xs text-ink-muted">
            Prefilled from the applied settings (FiO2 {formatFio2Value(context.settings.fio2)}
            {context.settings.fio2Estimated ? ", estimated" : ""}); change them if the sample was
            taken on other settings.
          </p>
        ) : null}

        <div className="flex flex-wrap items-center gap-3">
          <Button type="submit" disabled={isSubmitting}>
            {isSubmitting ? "Saving…" : "Save blood gas"}
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

"use client";

import Link from "next/link";
import { useRouter } from "next/navigation";
import { useCallback, useState, type ReactNode } from "react";
import {
  useForm,
  useWatch,
  type FieldError,
  type FieldErrors,
  type Resolver,
  type UseFormRegisterReturn,
} from "react-hook-form";
import { writeOrderAction } from "@/app/(app)/orders/actions";
import { Button } from "@/components/ui/Button";
import { Field, inputClasses } from "@/components/ui/Field";
import { IconWarning } from "@/components/ui/icons";
import {
  DEVICE_DEFAULTS,
  DEVICE_PROFILES,
  DEVICES,
  estimateFio2,
  SIGNATURE_MEANING,
  stepTableFitsDevice,
  TARGET_BAND_PRESETS,
  type Device,
} from "@/lib/orders/devices";
import type { OrderView } from "@/lib/orders/queries";
import { orderInputSchema } from "@/lib/orders/schema";
import { fromMmHg, toMmHg, type PressureUnit } from "@/lib/oxygen";
import { formatFio2Range, formatOrderTime, OrderStatusBadge } from "./OrderFacts";

// ---------------------------------------------------------------------------
// Form values, defaults and the mapping onto the shared order schema
// ---------------------------------------------------------------------------

/** What the composer holds: text as typed (kept on refusal), choices as chosen. */
export type ComposerValues = {
  device: Device | "";
  bandChoice: string;
  spo2Lower: string;
  spo2Upper: string;
  pao2Lower: string;
  pao2Upper: string;
  fio2Min: string;
  fio2Max: string;
  initialFio2: string;
  peepMin: string;
  peepMax: string;
  initialPeep: string;
  flowMin: string;
  flowMax: string;
  initialFlow: string;
  stepTableId: string;
  reassessChoice: string;
  reassessCustom: string;
  rationale: string;
  password: string;
  entryMode: "verbal" | "telephone";
  prescriberId: string;
  readBackConfirmed: boolean;
};
type FormField = keyof ComposerValues;
type NumericField =
  | "pao2Lower"
  | "pao2Upper"
  | "peepMin"
  | "peepMax"
  | "initialPeep"
  | "flowMin"
  | "flowMax"
  | "initialFlow";

const BAND_CHOICES = TARGET_BAND_PRESETS.map((p) => ({
  value: `${p.lower}-${p.upper}`,
  lower: p.lower,
  upper: p.upper,
  label: p.label,
}));
const CUSTOM = "custom";
export const REASSESS_PRESETS = [
  { minutes: 30, label: "30 min" },
  { minutes: 60, label: "1 h" },
  { minutes: 120, label: "2 h" },
  { minutes: 240, label: "4 h" },
] as const;

const fio2Text = (v: number) => v.toFixed(2);
const plainText = (v: number | null | undefined) => (v === null || v === undefined ? "" : String(v));

/** The limit fields a device choice fills in, blank where the device has no such setting. */
export function limitValuesFor(device: Device): Pick<
  ComposerValues,
  "fio2Min" | "fio2Max" | "initialFio2" | "peepMin" | "peepMax" | "initialPeep" | "flowMin" | "flowMax" | "initialFlow"
> {
  const d = DEVICE_DEFAULTS[device];
  return {
    fio2Min: fio2Text(d.fio2[0]),
    fio2Max: fio2Text(d.fio2[1]),
    initialFio2: fio2Text(d.fio2[2]),
    peepMin: plainText(d.peep?.[0]),
    peepMax: plainText(d.peep?.[1]),
    initialPeep: plainText(d.peep?.[2]),
    flowMin: plainText(d.flow?.[0]),
    flowMax: plainText(d.flow?.[1]),
    initialFlow: plainText(d.flow?.[2]),
  };
}

/** A new order starts from the one in effect (the usual change is a small one), or blank. */
export function initialValues(current: OrderView | null, pressureUnit: PressureUnit): ComposerValues {
  const pao2 = (v: number | undefined) =>
    v === undefined ? "" : pressureUnit === "mmHg" ? String(v) : fromMmHg(v, "kPa").toFixed(1);
  const base: ComposerValues = {
    device: "",
    bandChoice: BAND_CHOICES[0]!.value,
    spo2Lower: "",
    spo2Upper: "",
    pao2Lower: "",
    pao2Upper: "",
    fio2Min: "",
    fio2Max: "",
    initialFio2: "",
    peepMin: "",
    peepMax: "",
    initialPeep: "",
    flowMin: "",
    flowMax: "",
    initialFlow: "",
    stepTableId: "",
    reassessChoice: "60",
    reassessCustom: "",
    rationale: "",
    password: "",
    entryMode: "verbal",
    prescriberId: "",
    readBackConfirmed: false,
  };
  if (!current) return base;
  const preset = BAND_CHOICES.find(
    (b) => b.lower === current.spo2Band.lower && b.upper === current.spo2Band.upper,
  );
  const reassessPreset = REASSESS_PRESETS.some((p) => p.minutes === current.reassessMinutes);
  return {
    ...base,
    device: current.device,
    bandChoice: preset ? preset.value : CUSTOM,
    spo2Lower: String(current.spo2Band.lower),
    spo2Upper: String(current.spo2Band.upper),
    pao2Lower: pao2(current.pao2Band?.lower),
    pao2Upper: pao2(current.pao2Band?.upper),
    fio2Min: fio2Text(current.limits.fio2Min),
    fio2Max: fio2Text(current.limits.fio2Max),
    initialFio2: fio2Text(current.initial.fio2),
    peepMin: plainText(current.limits.peepMin),
    peepMax: plainText(current.limits.peepMax),
    initialPeep: plainText(current.initial.peep),
    flowMin: plainText(current.limits.flowMin),
    flowMax: plainText(current.limits.flowMax),
    initialFlow: plainText(current.initial.flow),
    stepTableId: current.stepTableId === null ? "" : String(current.stepTableId),
    reassessChoice: reassessPreset ? String(current.reassessMinutes) : CUSTOM,
    reassessCustom: reassessPreset ? "" : String(current.reassessMinutes),
  };
}

// Text inputs (no scroll-wheel changes, a decimal comma accepted); empty is "not given".
function parseNumber(text: string): number | undefined {
  const t = text.trim();
  return t === "" ? undefined : Number(t.replace(",", "."));
}

const PAO2_RANGE_MMHG = { min: 40, max: 300 } as const;

export type BuildContext = {
  signer: "physician" | "other";
  pressureUnit: PressureUnit;
  patientId: number;
  supersedesOrderId: number | null;
  idempotencyKey: string;
};

/**
 * Turns what was typed into the shared schema's input. Errors the schema
 * cannot see (a non-number in an optional field, a kPa value out of range)
 * come back beside their fields; half a PaO2 band is the schema's to refuse.
 */
export function buildOrderInput(
  values: ComposerValues,
  ctx: BuildContext,
): { input: Record<string, unknown>; errors: Partial<Record<FormField, string>> } {
  const errors: Partial<Record<FormField, string>> = {};
  const profile = values.device === "" ? null : DEVICE_PROFILES[values.device];
  const optional = (field: NumericField, label: string): number | undefined => {
    const n = parseNumber(values[field]);
    if (n !== undefined && !Number.isFinite(n)) {
      errors[field] = `${label} must be a number.`;
      return undefined;
    }
    return n;
  };
  const band = BAND_CHOICES.find((b) => b.value === values.bandChoice);
  const pao2 = (field: "pao2Lower" | "pao2Upper", label: string): number | undefined => {
    const n = optional(field, label);
    if (n === undefined) return undefined;
    if (ctx.pressureUnit === "mmHg") return n;
    try {
      // One decimal, as stored (DECIMAL(5,1) mmHg).
      return Math.round(toMmHg(n, "kPa") * 10) / 10;
    } catch {
      errors[field] = pao2RangeMessage(label, "kPa");
      return undefined;
    }
  };
  const pao2Lower = pao2("pao2Lower", "PaO2 lower bound");
  const pao2Upper = pao2("pao2Upper", "PaO2 upper bound");
  const peep = profile?.uses.peep ?? false;
  const flow = profile?.uses.flow ?? false;
  const input: Record<string, unknown> = {
    patientId: ctx.patientId,
    device: values.device === "" ? undefined : values.device,
    spo2Lower: band ? band.lower : parseNumber(values.spo2Lower),
    spo2Upper: band ? band.upper : parseNumber(values.spo2Upper),
    pao2Lower,
    pao2Upper,
    fio2Min: parseNumber(values.fio2Min),
    fio2Max: parseNumber(values.fio2Max),
    initialFio2: parseNumber(values.initialFio2),
    peepMin: peep ? optional("peepMin", "PEEP minimum") : undefined,
    peepMax: peep ? optional("peepMax", "PEEP maximum") : undefined,
    initialPeep: peep ? optional("initialPeep", "Starting PEEP") : undefined,
    flowMin: flow ? optional("flowMin", "Flow minimum") : undefined,
    flowMax: flow ? optional("flowMax", "Flow maximum") : undefined,
    initialFlow: flow ? optional("initialFlow", "Starting flow") : undefined,
    stepTableId: values.stepTableId === "" ? undefined : Number(values.stepTableId),
    reassessMinutes:
      values.reassessChoice === CUSTOM ? parseNumber(values.reassessCustom) : Number(values.reassessChoice),
    rationale: values.rationale,
    supersedesOrderId: ctx.supersedesOrderId,
    idempotencyKey: ctx.idempotencyKey,
    ...(ctx.signer === "physician"
      ? { entryMode: "written", password: values.password }
      : {
          entryMode: values.entryMode,
          prescriberId: values.prescriberId === "" ? undefined : Number(values.prescriberId),
          readBackConfirmed: values.readBackConfirmed,
        }),
  };
  return { input, errors };
}

function pao2RangeMessage(label: string, unit: PressureUnit): string {
  if (unit === "mmHg") return `${label} must be between ${PAO2_RANGE_MMHG.min} and ${PAO2_RANGE_MMHG.max} mmHg.`;
  const kpa = (v: number) => fromMmHg(v, "kPa").toFixed(1);
  return `${label} must be between ${kpa(PAO2_RANGE_MMHG.min)} and ${kpa(PAO2_RANGE_MMHG.max)} kPa (${PAO2_RANGE_MMHG.min}–${PAO2_RANGE_MMHG.max} mmHg).`;
}

const DIRECT_FIELDS = new Set<string>([
  "device",
  "fio2Min",
  "fio2Max",
  "initialFio2",
  "peepMin",
  "peepMax",
  "initialPeep",
  "flowMin",
  "flowMax",
  "initialFlow",
  "stepTableId",
  "rationale",
  "password",
  "entryMode",
  "prescriberId",
  "readBackConfirmed",
  "pao2Lower",
  "pao2Upper",
]);

/** Where an error on a schema path (client or server) is shown in the composer. */
export function formFieldOf(path: string, values: ComposerValues): FormField | null {
  if (path === "spo2Lower" || path === "spo2Upper") return values.bandChoice === CUSTOM ? path : "bandChoice";
  if (path === "reassessMinutes") return values.reassessChoice === CUSTOM ? "reassessCustom" : "reassessChoice";
  return DIRECT_FIELDS.has(path) ? (path as FormField) : null;
}

/** Messages in mmHg are restated in kPa for a kPa user, who typed kPa. */
function restate(path: string, message: string, unit: PressureUnit): string {
  if (unit === "kPa" && (path === "pao2Lower" || path === "pao2Upper") && /between 40 and 300 mmHg/.test(message)) {
    return pao2RangeMessage(path === "pao2Lower" ? "PaO2 lower bound" : "PaO2 upper bound", "kPa");
  }
  return message;
}

// ---------------------------------------------------------------------------
// The composer
// ---------------------------------------------------------------------------

/** A card holding one group of the order, named by its legend. */
function Section({ title, children }: { title: string; children: ReactNode }) {
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
function ChoiceGroup({
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

export type StepTableChoice = { id: number; name: string; kind: "fio2_peep" | "flow_fio2"; unitOwn: boolean };
export type PhysicianChoice = { id: number; name: string; onDuty: boolean };

function stepTableFits(kind: StepTableChoice["kind"], device: Device | ""): boolean {
  return device !== "" && stepTableFitsDevice(kind, device);
}

function newIdempotencyKey(): string {
  if (typeof crypto.randomUUID === "function") return crypto.randomUUID();
  // Plain-HTTP deployments have no randomUUID; getRandomValues works everywhere.
  return Array.from(crypto.getRandomValues(new Uint8Array(16)), (b) => b.toString(16).padStart(2, "0")).join("");
}

const percentOf = (text: string): string => {
  const n = parseNumber(text);
  return n !== undefined && Number.isFinite(n) && n > 0 && n <= 1 ? `${Math.round(n * 100)}\u00a0%` : "—";
};

/**
 * The order composer: device and limits, target band, step table, reassessment
 * and rationale, then the physician's signature or the nurse's/therapist's
 * read-back. Validated with the shared schema before sending and again on the
 * server; refusals land beside their fields and nothing typed is lost.
 */
export function OrderComposer({
  patient,
  signer,
  pressureUnit,
  timeZone,
  currentOrder,
  currentStepTableName,
  stepTables,
  physicians,
}: {
  patient: { id: number; name: string; bedLabel: string };
  signer: "physician" | "other";
  pressureUnit: PressureUnit;
  timeZone: string;
  currentOrder: OrderView | null;
  currentStepTableName: string | null;
  stepTables: StepTableChoice[];
  physicians: PhysicianChoice[];
}) {
  const router = useRouter();
  // One key per composer: a double submit or a retry after a lost answer writes once.
  const [idempotencyKey] = useState(newIdempotencyKey);
  const [formError, setFormError] = useState<string | null>(null);
  const [conflict, setConflict] = useState<string | null>(null);
  const [done, setDone] = useState(false);

  const resolver = useCallback<Resolver<ComposerValues>>(
    (values) => {
      const { input, errors: local } = buildOrderInput(values, {
        signer,
        pressureUnit,
        patientId: patient.id,
        supersedesOrderId: null,
        idempotencyKey,
      });
      const found: Partial<Record<FormField, FieldError>> = {};
      for (const [field, message] of Object.entries(local) as [FormField, string][]) {
        found[field] = { type: "validate", message };
      }
      const parsed = orderInputSchema.safeParse(input);
      if (!parsed.success) {
        for (const issue of parsed.error.issues) {
          const path = issue.path.map(String).join(".");
          const field = formFieldOf(path, values);
          if (field && !found[field]) {
            found[field] = { type: "validate", message: restate(path, issue.message, pressureUnit) };
          }
        }
      }
      return Object.keys(found).length > 0
        ? { values: {}, errors: found as FieldErrors<ComposerValues> }
        : { values, errors: {} };
    },
    [signer, pressureUnit, patient.id, idempotencyKey],
  );

  const {
    register,
    control,
    handleSubmit,
    setError,
    setValue,
    clearErrors,
    getValues,
    formState: { errors, isSubmitting },
  } = useForm<ComposerValues>({
    resolver,
    defaultValues: initialValues(currentOrder, pressureUnit),
  });
  const values = useWatch({ control });
  const device = values.device ?? "";
  const profile = device === "" ? null : DEVICE_PROFILES[device];
  const estimated = profile?.uses.fio2 === "estimated";
  const fittingTables = stepTables.filter((t) => stepTableFits(t.kind, device));
  const prescriber = physicians.find((p) => String(p.id) === values.prescriberId);

  const chooseDevice = (next: Device | "") => {
    if (next === "") return;
    const limits = limitValuesFor(next);
    for (const [field, value] of Object.entries(limits) as [FormField, string][]) {
      setValue(field, value, { shouldDirty: true });
    }
    const table = stepTables.find((t) => String(t.id) === getValues("stepTableId"));
    if (table && !stepTableFits(table.kind, next)) setValue("stepTableId", "");
    clearErrors(Object.keys(limits) as FormField[]);
  };

  // A low-flow device delivers what the flow gives: the starting FiO2 follows the flow.
  const followFlow = (flowText: string) => {
    if (device === "" || !estimated) return;
    const n = parseNumber(flowText);
    const fio2 = n !== undefined && Number.isFinite(n) ? estimateFio2(device, n) : null;
    if (fio2 !== null) setValue("initialFio2", fio2Text(fio2));
  };

  const onSubmit = handleSubmit(async (submitted) => {
    setFormError(null);
    setConflict(null);
    const { input } = buildOrderInput(submitted, {
      signer,
      pressureUnit,
      patientId: patient.id,
      supersedesOrderId: currentOrder?.id ?? null,
      idempotencyKey,
    });
    let result: Awaited<ReturnType<typeof writeOrderAction>>;
    try {
      result = await writeOrderAction(input);
    } catch {
      setFormError("Tidemark could not be reached. Nothing was saved; your entries are kept. Try again.");
      return;
    }
    if (result.ok) {
      setDone(true);
      router.push(`/patients/${patient.id}`);
      return;
    }
    if (result.status === 409) {
      setConflict(result.message);
      return;
    }
    let placed = false;
    let focused = false;
    const unplaced: string[] = [];
    for (const [path, messages] of Object.entries(result.fieldErrors ?? {})) {
      const field = formFieldOf(path, submitted);
      const message = messages.map((m) => restate(path, m, pressureUnit)).join(" ");
      if (!field) {
        unplaced.push(message);
        continue;
      }
      if (field === "password") setValue("password", "");
      setError(field, { type: "server", message }, { shouldFocus: !focused });
      placed = true;
      focused = true;
    }
    setFormError(
      [
        placed ? "Not saved: see the message beside each marked field. Everything you typed is kept." : result.message,
        ...unplaced,
      ].join(" "),
    );
  });

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

  const fio2Input = (name: "fio2Min" | "fio2Max" | "initialFio2", label: string, hint?: ReactNode, readOnly = false) => (
    <Field id={`order-${name}`} label={label} hint={hint} error={errors[name]?.message}>
      {(d, invalid) => (
        <div className="flex items-center gap-2">
          {text(name, d, invalid, { readOnly })}
          <span className="w-12 shrink-0 text-right text-sm text-ink-muted tabular" aria-hidden="true">
            {percentOf(values[name] ?? "")}
          </span>
        </div>
      )}
    </Field>
  );

  const unitInput = (name: FormField, label: string, unit: string, registered?: UseFormRegisterReturn) => (
    <Field id={`order-${name}`} label={`${label} (${unit})`} error={errors[name]?.message}>
      {(d, invalid) => text(name, d, invalid, registered ? { registered } : {})}
    </Field>
  );

  const card = "rounded-card border border-border bg-surface p-4 shadow-card";
  const flowRange = profile?.flow;
  const peepRange = profile?.peep;

  return (
    <div className="grid items-start gap-5 lg:grid-cols-[minmax(0,1fr)_18rem]">
      <form onSubmit={onSubmit} noValidate aria-label="Order" className="min-w-0 space-y-4">
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
                    onChange: (e: { target: { value: string } }) => chooseDevice(e.target.value as Device | ""),
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
              <p className="text-sm font-medium">FiO2 (fraction, 0.21–1.00)</p>
              <div className="grid gap-x-4 sm:grid-cols-3">
                {fio2Input("fio2Min", "FiO2 minimum")}
                {fio2Input("fio2Max", "FiO2 maximum")}
                {fio2Input(
                  "initialFio2",
                  "Starting FiO2",
                  estimated ? "Estimated from the starting flow; change the flow to change it." : undefined,
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
                  limits and the starting FiO2 are estimates from the flow (common rule of thumb), and the
                  bedside record starts from that estimate.
                </p>
              ) : null}
            </div>
          ) : null}
        </Section>

        <Section title="Target band">
          <div className="grid gap-x-6 gap-y-2 md:grid-cols-2">
            <div>
              <ChoiceGroup legend="SpO2 target band" errorId="order-bandChoice-error" error={errors.bandChoice?.message}>
                {BAND_CHOICES.map((b) => (
                  <label key={b.value} className="flex items-center gap-2 text-sm">
                    <input type="radio" value={b.value} className="size-4 accent-accent" {...register("bandChoice")} />
                    <span className="tabular">{b.label}</span>
                  </label>
                ))}
                <label className="flex items-center gap-2 text-sm">
                  <input type="radio" value={CUSTOM} className="size-4 accent-accent" {...register("bandChoice")} />
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
                <p className="text-xs text-ink-muted">Typed in kPa; stored in mmHg (1 kPa = 7.50062 mmHg).</p>
              ) : (
                <p className="text-xs text-ink-muted">Leave both empty for no PaO2 band.</p>
              )}
            </fieldset>
          </div>
        </Section>

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
                  <input type="radio" value={CUSTOM} className="size-4 accent-accent" {...register("reassessChoice")} />
                  Custom
                </label>
              </ChoiceGroup>
              {values.reassessChoice === CUSTOM ? unitInput("reassessCustom", "Interval", "minutes, 15–1440") : null}
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

        {signer === "physician" ? (
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
              The order takes effect marked &ldquo;Awaiting co-sign&rdquo; until the physician co-signs it.
            </p>
            <div className="grid gap-x-4 sm:grid-cols-2">
              <ChoiceGroup
                legend="How the order was given"
                errorId="order-entryMode-error"
                error={errors.entryMode?.message}
                inline
              >
                <label className="flex items-center gap-2 text-sm">
                  <input type="radio" value="verbal" className="size-4 accent-accent" {...register("entryMode")} />
                  Verbal (in person)
                </label>
                <label className="flex items-center gap-2 text-sm">
                  <input type="radio" value="telephone" className="size-4 accent-accent" {...register("entryMode")} />
                  Telephone
                </label>
              </ChoiceGroup>
              <Field id="order-prescriberId" label="Ordering physician" error={errors.prescriberId?.message}>
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
                  aria-describedby={errors.readBackConfirmed ? "order-readBackConfirmed-error" : "order-readback-hint"}
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
        )}

        {conflict ? (
          <div role="alert" className="space-y-2 rounded-card border border-overdue bg-overdue-soft p-3 text-sm text-ink">
            <p className="flex items-start gap-2 font-medium">
              <IconWarning className="mt-0.5 shrink-0 text-overdue" />
              <span>Not saved: {conflict}</span>
            </p>
            <div className="flex flex-wrap items-center gap-3">
              <Button
                variant="secondary"
                onClick={() => {
                  setConflict(null);
                  router.refresh();
                }}
              >
                Show the order now in effect (keeps what you typed)
              </Button>
              <a href={`/patients/${patient.id}/orders/new`} className="text-accent underline underline-offset-2">
                Reload this page (starts again)
              </a>
            </div>
          </div>
        ) : null}

        <div className="flex flex-wrap items-center gap-3">
          <Button type="submit" disabled={isSubmitting || done}>
            {signer === "physician"
              ? isSubmitting || done
                ? "Signing…"
                : "Sign order"
              : isSubmitting || done
                ? "Entering…"
                : values.entryMode === "telephone"
                  ? "Enter telephone order"
                  : "Enter verbal order"}
          </Button>
          <p role="status" aria-live="polite" className="text-sm">
            {formError ? <span className="font-medium text-below">{formError}</span> : null}
            {done ? <span className="text-in-band">Saved. Opening the Chart…</span> : null}
          </p>
        </div>
      </form>

      <aside className="space-y-4 lg:sticky lg:top-4" aria-label="Order in effect and summary">
        <section className={card} aria-labelledby="order-current-heading" data-testid="order-in-effect">
          <h2 id="order-current-heading" className="text-sm font-semibold">
            Order in effect
          </h2>
          {currentOrder ? (
            <div className="mt-2 space-y-2 text-sm">
              <div className="flex flex-wrap items-center gap-2">
                <Link href={`/orders/${currentOrder.id}`} className="font-medium text-accent underline-offset-2 hover:underline">
                  Order #{currentOrder.id}
                </Link>
                <OrderStatusBadge status={currentOrder.status} />
              </div>
              <dl className="grid grid-cols-[auto_1fr] gap-x-3 gap-y-0.5">
                <dt className="text-ink-muted">Device</dt>
                <dd>{DEVICE_PROFILES[currentOrder.device].label}</dd>
                <dt className="text-ink-muted">SpO2</dt>
                <dd className="tabular">
                  {currentOrder.spo2Band.lower}–{currentOrder.spo2Band.upper} %
                </dd>
                <dt className="text-ink-muted">FiO2</dt>
                <dd className="tabular">{formatFio2Range(currentOrder.limits.fio2Min, currentOrder.limits.fio2Max)}</dd>
                {currentOrder.limits.peepMin !== null ? (
                  <>
                    <dt className="text-ink-muted">PEEP</dt>
                    <dd className="tabular">
                      {currentOrder.limits.peepMin}–{currentOrder.limits.peepMax} cmH2O
                    </dd>
                  </>
                ) : null}
                {currentOrder.limits.flowMin !== null ? (
                  <>
                    <dt className="text-ink-muted">Flow</dt>
                    <dd className="tabular">
                      {currentOrder.limits.flowMin}–{currentOrder.limits.flowMax} L/min
                    </dd>
                  </>
                ) : null}
                <dt className="text-ink-muted">Step table</dt>
                <dd>{currentStepTableName ?? "None"}</dd>
                <dt className="text-ink-muted">Prescriber</dt>
                <dd>{currentOrder.prescriber.name}</dd>
                <dt className="text-ink-muted">Since</dt>
                <dd className="tabular">{formatOrderTime(currentOrder.createdAt, timeZone)}</dd>
              </dl>
              <p className="text-xs text-ink-muted">
                Yours replaces it: order #{currentOrder.id} becomes superseded.
              </p>
            </div>
          ) : (
            <p className="mt-2 text-sm text-ink-muted">No order in effect for {patient.name}.</p>
          )}
        </section>
        <OrderReadBack values={values} pressureUnit={pressureUnit} stepTables={stepTables} />
      </aside>
    </div>
  );
}

/** The order in words as it stands in the form: what is signed, or read back. */
function OrderReadBack({
  values,
  pressureUnit,
  stepTables,
}: {
  values: Partial<ComposerValues>;
  pressureUnit: PressureUnit;
  stepTables: StepTableChoice[];
}) {
  const device = values.device ?? "";
  const profile = device === "" ? null : DEVICE_PROFILES[device];
  const band = BAND_CHOICES.find((b) => b.value === values.bandChoice);
  const show = (t: string | undefined) => (t && t.trim() !== "" ? t.trim() : "—");
  const range = (min: string | undefined, max: string | undefined, start: string | undefined, unit: string) =>
    `${show(min)}–${show(max)} ${unit}, start ${show(start)} ${unit}`;
  const lines: [string, string][] = [];
  lines.push(["Device", profile?.label ?? "—"]);
  lines.push([
    "SpO2 band",
    band ? `${band.lower}–${band.upper} %` : `${show(values.spo2Lower)}–${show(values.spo2Upper)} %`,
  ]);
  if (values.pao2Lower || values.pao2Upper) {
    lines.push(["PaO2 band", `${show(values.pao2Lower)}–${show(values.pao2Upper)} ${pressureUnit}`]);
  }
  if (profile) {
    lines.push([
      "FiO2",
      `${show(values.fio2Min)}–${show(values.fio2Max)}, start ${show(values.initialFio2)} (${percentOf(values.initialFio2 ?? "")})`,
    ]);
    if (profile.uses.peep) lines.push(["PEEP", range(values.peepMin, values.peepMax, values.initialPeep, "cmH2O")]);
    if (profile.uses.flow) lines.push(["Flow", range(values.flowMin, values.flowMax, values.initialFlow, "L/min")]);
  }
  const table = stepTables.find((t) => String(t.id) === values.stepTableId);
  lines.push(["Step table", table?.name ?? "None"]);
  lines.push([
    "Reassess",
    values.reassessChoice === CUSTOM ? `every ${show(values.reassessCustom)} min` : `every ${values.reassessChoice ?? "—"} min`,
  ]);
  return (
    <section className="rounded-card border border-border bg-surface p-4 shadow-card" aria-labelledby="order-readback-heading">
      <h2 id="order-readback-heading" className="text-sm font-semibold">
        Your order, in words
      </h2>
      <dl className="mt-2 grid grid-cols-[auto_1fr] gap-x-3 gap-y-0.5 text-sm" data-testid="order-read-back">
        {lines.map(([term, value]) => (
          <div key={term} className="contents">
            <dt className="text-ink-muted">{term}</dt>
            <dd className="tabular min-w-0 break-words">{value}</dd>
          </div>
        ))}
      </dl>
    </section>
  );
}
